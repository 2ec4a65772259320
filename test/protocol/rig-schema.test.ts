// The rig schema: one clear line per bad rig (unit mistakes named), the contract keys of issues #16–#18,
// assumed uncertainties said, and the shipped JSON Schema in sync with the parser and usable by a validator.
import { readFileSync } from 'node:fs';
import { Ajv2020 } from 'ajv/dist/2020.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { assumedNote, isSimpleRig, parseRig, rigJson, type AnyRig } from '../../protocol/rig.ts';
import { rigSchemaFileText } from '../../protocol/rig-schema.ts';
import { listScenarios } from '../../sim/index.ts';

const base = { length_m: 1, flag_width_m: 0.0254 };
const reversible = { pendulum: 'reversible', pivot: 1, edge_distance_m: 1, edge_distance_u_m: 2e-5, cm_distance_m: 0.6, cm_distance_u_m: 0.001, flag_radius_m: 1.1, flag_width_m: 0.01, flag_width_u_m: 1e-4 };
const error = (v: unknown): string => {
  const r = parseRig(v);
  if (r.ok) throw new Error(`accepted: ${JSON.stringify(v)}`);
  return r.error;
};
const ok = (v: unknown): AnyRig => {
  const r = parseRig(v);
  if (!r.ok) throw new Error(r.error);
  return r.rig;
};

describe('rig plausibility: each refusal is one line naming the likely unit mistake', () => {
  it.each([
    // The issue's own example: lengths written in millimetres.
    [{ length_m: 812.5, flag_width_m: 0.0254 }, 'length_m 812.5 looks like millimetres: write 0.8125'],
    [{ length_m: 0.8125, flag_width_m: 25.4 }, 'flag_width_m 25.4 looks like millimetres: write 0.0254'],
    [{ length_m: 81.25, flag_width_m: 0.0254 }, 'length_m 81.25 looks like centimetres: write 0.8125'],
    [{ length_m: 1, flag_width_m: 2.54 }, 'flag_width_m 2.54 looks like centimetres: write 0.0254'],
    [{ length_m: 1e308, flag_width_m: 0.02 }, 'length_m 1e+308 is outside 0.05 to 30 m'],
    [{ length_m: 0.01, flag_width_m: 0.002 }, 'length_m 0.01 is outside 0.05 to 30 m'],
    [{ ...base, length_u_m: 0.5 }, 'length_u_m 0.5 is more than a tenth of length_m 1; looks like millimetres: write 0.0005'],
    [{ ...base, flag_width_u_m: 0.2 }, 'flag_width_u_m 0.2 looks like millimetres: write 0.0002'],
    [{ ...base, bob_mass_kg: 67 }, 'bob_mass_kg 67 looks like grams: write 0.067'],
    [{ ...base, bob_density_kg_m3: 7.85 }, 'bob_density_kg_m3 7.85 looks like g/cm³: write 7850'],
    [{ ...base, length_temp_C: 293.15 }, 'length_temp_C 293.15 looks like kelvin: write 20'],
    [{ ...base, length_step_u_m: 0.02 }, 'length_step_u_m 0.02 looks like millimetres: write 0.00002'],
    [{ length_m: 0.1, flag_width_m: 0.2 }, 'flag_width_m 0.2 is wider than a swing at length_m 0.1 can clear (the beam would stay blocked over ±90°)'],
    [{ ...base, bob_diameter_m: 2.5 }, 'bob_diameter_m 2.5 looks like centimetres: write 0.025'],
    [{ length_m: 1, flag_width_m: '25' }, 'flag_width_m must be a number, not "25"'],
    [{ flag_width_m: 0.02 }, 'rig lacks required key "length_m"'],
    [{ ...base, blocked_level: 'hi' }, 'blocked_level must be "low" or "high", not "hi"'],
    [{ ...base, pendulum: 'simpel' }, 'pendulum must be "simple" or "reversible", not "simpel"'],
  ])('%j → %s', (rig, line) => {
    expect(error(rig)).toBe(line);
  });

  it('non-finite values are refused (JSON text 1e400 parses to Infinity)', () => {
    expect(error('{"length_m": 1e400, "flag_width_m": 0.02}')).toBe('length_m must be a finite number');
    expect(error({ length_m: Number.NaN, flag_width_m: 0.02 })).toBe('length_m must be a finite number');
  });

  it('a typo names the key it most likely meant (edit distance, swaps count once)', () => {
    expect(error({ ...base, lenght_u_m: 0.001 })).toBe('unknown rig key "lenght_u_m" (did you mean "length_u_m"?)');
    expect(error({ lenght_m: 1, flag_width_m: 0.02 })).toBe('unknown rig key "lenght_m" (did you mean "length_m"?)');
    expect(error({ ...base, flagwidth_u_m: 0.001 })).toBe('unknown rig key "flagwidth_u_m" (did you mean "flag_width_u_m"?)');
    expect(error({ ...base, colour: 'red' })).toBe('unknown rig key "colour"');
  });

  it('every value inside the ranges that the file gives is kept as given', () => {
    const r = ok({ ...base, length_u_m: 3e-4, flag_width_u_m: 1e-4, bob_mass_kg: 0.067, latitude_deg: 48.1, elevation_m: 520, name: 'bench' });
    expect(r).toMatchObject({ length_m: 1, length_u_m: 3e-4, flag_width_m: 0.0254, flag_width_u_m: 1e-4, bob_mass_kg: 0.067, blocked_level: 'low', air_density_kg_m3: 1.2 });
    expect(r.assumed).toBeUndefined();
  });
});

describe('uncertainties the rig leaves out are assumed, and said so', () => {
  it('both missing: filled, listed, and told in one line', () => {
    const r = ok(base);
    expect(r.assumed).toEqual(['length_u_m', 'flag_width_u_m']);
    expect(r.flag_width_u_m).toBe(0.0002);
    expect(isSimpleRig(r) && r.length_u_m).toBe(0.001);
    expect(assumedNote(r)).toBe(
      'the rig gives no length_u_m (1 mm assumed) and flag_width_u_m (0.2 mm assumed); the uncertainty of g rests on these guesses: measure and write them in the rig file',
    );
  });

  it('the journal line leaves assumed values out, so a re-read still knows they were assumed', () => {
    const r = ok({ ...base, length_u_m: 5e-4 });
    expect(r.assumed).toEqual(['flag_width_u_m']);
    expect(rigJson(r)).toBe('{"length_m":1,"length_u_m":0.0005,"flag_width_m":0.0254,"blocked_level":"low","channel":0,"air_density_kg_m3":1.2}');
    expect(ok(JSON.parse(rigJson(r)))).toEqual(r);
  });
});

describe('the contract keys of the other issues', () => {
  it('#16 beams: one or two {channel 0|1, angle_deg}; replaces channel; both refused', () => {
    const two = ok({ ...base, beams: [{ channel: 0, angle_deg: 45 }, { channel: 1, angle_deg: -45 }] });
    expect(two.beams).toEqual([{ channel: 0, angle_deg: 45 }, { channel: 1, angle_deg: -45 }]);
    expect(ok({ ...base, channel: 1 }).beams).toEqual([{ channel: 1, angle_deg: 0 }]);
    expect(ok(base).beams).toEqual([{ channel: 0, angle_deg: 0 }]);
    expect(error({ ...base, channel: 0, beams: [{ channel: 0, angle_deg: 0 }] })).toBe('give either beams or channel, not both (beams replaces channel)');
    expect(error({ ...base, beams: [{ channel: 1, angle_deg: 45 }, { channel: 1, angle_deg: -45 }] })).toBe('beams: both beams are on channel 1; each beam needs its own channel');
    expect(error({ ...base, beams: [{ channel: 2, angle_deg: 0 }] })).toBe('beams[0].channel must be 0 or 1, not 2');
    expect(error({ ...base, beams: [] })).toBe('beams must hold 1 or 2 beams');
    expect(error({ ...base, beams: [{ channel: 0 }] })).toBe('beams[0].angle_deg is missing');
    expect(error({ ...base, beams: [{ channel: 0, angle_deg: 0, tilt: 1 }] })).toBe('unknown key "tilt" in beams[0] (a beam has channel and angle_deg)');
    // A journal line of a two-beam rig carries beams, not channel, and reads back the same.
    expect(ok(JSON.parse(rigJson(two)))).toEqual(two);
    expect(rigJson(two)).not.toMatch(/"channel":0,"air/);
  });

  it('#17 two lengths: length_step_u_m on the ordinary pendulum', () => {
    expect(ok({ ...base, length_step_u_m: 2e-5 })).toMatchObject({ length_step_u_m: 2e-5 });
  });

  it('#17 reversible pendulum: its keys, no length_m, pivot 1 or 2, the centre of mass between the edges', () => {
    const r = ok({ ...reversible, mass_position_m: 0.25, body_volume_m3: 2.5e-4, body_mass_kg: 2.1 });
    expect(r).toMatchObject({ pendulum: 'reversible', pivot: 1, edge_distance_m: 1, cm_distance_m: 0.6, flag_radius_m: 1.1, mass_position_m: 0.25 });
    expect(isSimpleRig(r)).toBe(false);
    expect(r.assumed).toBeUndefined();
    expect(ok(JSON.parse(rigJson(r)))).toEqual(r);
    expect(error({ ...reversible, length_m: 1 })).toBe('a reversible pendulum has no length_m: give edge_distance_m, cm_distance_m and flag_radius_m');
    expect(error({ ...reversible, pivot: 3 })).toBe('pivot must be 1 or 2, not 3');
    expect(error({ ...reversible, cm_distance_m: 1.2 })).toBe('cm_distance_m 1.2 must be less than edge_distance_m 1: the centre of mass lies between the knife edges');
    expect(error({ ...reversible, edge_distance_m: 995 })).toBe('edge_distance_m 995 looks like millimetres: write 0.995');
    expect(error({ ...reversible, body_volume_m3: 250, body_mass_kg: 2.1 })).toBe('body_volume_m3 250 looks like cm³: write 0.00025');
    expect(error({ ...reversible, body_volume_m3: 2.5e-4 })).toBe('body_volume_m3 and body_mass_kg go together (the air correction needs both)');
    const { edge_distance_u_m: _u, ...noU } = reversible;
    expect(error(noU)).toBe('rig lacks required key "edge_distance_u_m"');
    expect(error({ ...base, mass_position_m: 0.2 })).toBe('mass_position_m belongs to a reversible pendulum: add "pendulum": "reversible" (and drop length_m)');
    expect(error({ ...reversible, bob_mass_kg: 0.1 })).toBe('bob_mass_kg is not a key of a reversible pendulum');
  });

  it('#18 length_temp_C on either pendulum', () => {
    expect(ok({ ...base, length_temp_C: 21.5 })).toMatchObject({ length_temp_C: 21.5 });
    expect(ok({ ...reversible, length_temp_C: -5 })).toMatchObject({ length_temp_C: -5 });
  });

  it('"$schema" is allowed (for editors) and not carried into the journal', () => {
    const r = ok({ $schema: './rig.schema.json', ...base });
    expect(rigJson(r)).not.toContain('schema');
  });
});

describe('protocol/rig.schema.json', () => {
  const file = readFileSync(new URL('../../protocol/rig.schema.json', import.meta.url), 'utf8');
  const validate = new Ajv2020({ strict: true, allErrors: true }).compile(JSON.parse(file) as object);

  it('is in sync with the zod schema (regenerate with npm run rig:schema)', () => {
    expect(file).toBe(rigSchemaFileText());
  });

  it('a standard JSON Schema validator accepts the bundled scenario rigs and refuses unit mistakes and typos', () => {
    for (const n of listScenarios()) {
      const raw = JSON.parse(readFileSync(new URL(`../../sim/scenarios/${n}.json`, import.meta.url), 'utf8')) as { rig: unknown };
      expect(validate(raw.rig), n).toBe(true);
    }
    expect(validate({ ...reversible, mass_position_m: 0.1 })).toBe(true);
    expect(validate({ length_m: 812.5, flag_width_m: 0.0254 })).toBe(false);
    expect(validate({ ...base, lenght_u_m: 0.001 })).toBe(false);
    expect(validate({ ...reversible, length_m: 1 })).toBe(false);
  });

  // Property: the editor never flags a rig that halfswing accepts, and when both accept the typed values agree.
  const finite = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  const anyRig = fc.record(
    {
      length_m: fc.oneof(finite(0.01, 2000), fc.constant(1)),
      length_u_m: finite(0, 0.2),
      flag_width_m: fc.oneof(finite(1e-5, 40), fc.constant(0.02)),
      flag_width_u_m: finite(0, 0.2),
      bob_diameter_m: finite(1e-4, 1),
      channel: fc.integer({ min: -1, max: 9 }),
      blocked_level: fc.constantFrom('low', 'high', 'mid'),
      latitude_deg: finite(-100, 100),
      length_temp_C: finite(-50, 400),
      lenght_m: fc.constant(1),
    },
    { requiredKeys: [] },
  );
  it('whatever halfswing accepts, the shipped schema accepts', () => {
    fc.assert(
      fc.property(anyRig, (rig) => {
        if (parseRig(rig).ok) expect(validate(rig), JSON.stringify(validate.errors)).toBe(true);
      }),
      { numRuns: 400 },
    );
  });
});
