// The rig as measured: each value with a stated u drawn about the truth, reproducible from the seed, the physics untouched.
import { describe, expect, it } from 'vitest';
import { parseRig, rigJson, type AnyRig } from '../../protocol/rig.ts';
import { loadScenario, ScenarioError } from '../../sim/index.ts';
import { drawMeasuredRig } from '../../sim/measured-rig.ts';
import { loadSession } from '../../sim/outlets/scenario-files.ts';
import { Rng } from '../../sim/prng.ts';
import { sessionRuns } from '../../sim/session.ts';
import { simulateJournal } from '../../sim/simulate.ts';
import { scenario } from '../pipeline/sim-run.ts';

const rigOf = (v: unknown): AnyRig => {
  const r = parseRig(v);
  if (!r.ok) throw new Error(r.error);
  return r.rig;
};
const run = (sc: ReturnType<typeof loadScenario>, seed: number, measured_rig?: boolean) => {
  const { lines, truth } = simulateJournal(sc, { seed, durationS: 30, measured_rig });
  const all = [...lines];
  return { rigLine: all.find((l) => l.startsWith('#rig '))!.slice(5), data: all.filter((l) => !l.startsWith('#')), truth };
};

describe('the rig as measured', () => {
  it('draws each value with its stated u: over 4000 draws the mean is the truth and the spread the u (normal: 4σ bounds)', () => {
    const truth = rigOf({ length_m: 1, length_u_m: 5e-4, flag_width_m: 0.02, flag_width_u_m: 1e-4 });
    const rng = new Rng(11);
    const n = 4000;
    const err = { length_m: [] as number[], flag_width_m: [] as number[] };
    for (let i = 0; i < n; i++) {
      const m = drawMeasuredRig(truth, () => rng.normal()).rig as unknown as Record<string, number>;
      err.length_m.push((m.length_m! - 1) / 5e-4);
      err.flag_width_m.push((m.flag_width_m! - 0.02) / 1e-4);
    }
    for (const z of Object.values(err)) {
      const mean = z.reduce((s, v) => s + v, 0) / n;
      const sd = Math.sqrt(z.reduce((s, v) => s + (v - mean) ** 2, 0) / (n - 1));
      // mean of n unit normals: σ = 1/√n = 0.016; sample sd: σ ≈ 1/√(2n) = 0.011.
      expect(Math.abs(mean)).toBeLessThan(4 / Math.sqrt(n));
      expect(Math.abs(sd - 1)).toBeLessThan(4 / Math.sqrt(2 * n));
    }
  });

  it('an uncertainty the rig leaves out is drawn with the value the analysis assumes, and stays left out of the file', () => {
    const truth = rigOf({ length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 });
    const m = drawMeasuredRig(truth, () => 1);
    expect(m.draws.map((d) => [d.key, d.u])).toEqual([
      ['length_m', 0.001],
      ['flag_width_m', 0.0002],
      ['bob_diameter_m', 0.0002],
    ]);
    // The ball is its own flag: one calliper reading gives both.
    const file = JSON.parse(rigJson(m.rig)) as Record<string, number>;
    expect(Object.keys(file)).toEqual(['length_m', 'flag_width_m', 'bob_diameter_m', 'blocked_level', 'channel', 'air_density_kg_m3']);
    expect(file.length_m).toBeCloseTo(1.001, 12);
    expect(file.flag_width_m).toBeCloseTo(0.0256, 12);
    expect(file.bob_diameter_m).toBe(file.flag_width_m);
  });

  it('default off: the journal states the true rig; on: only the #rig line moves, reproducibly from the seed', () => {
    const sc = loadScenario('brass-1m-two-hours');
    const plain = run(sc, 4);
    expect(plain.rigLine).toBe(rigJson(sc.rig));
    expect(plain.truth.measured_rig).toBeUndefined();
    const a = run(sc, 4, true);
    const b = run(sc, 4, true);
    const c = run(sc, 5, true);
    expect(a.rigLine).toBe(b.rigLine);
    expect(a.rigLine).not.toBe(c.rigLine);
    expect(a.rigLine).not.toBe(plain.rigLine);
    // The bob and the device are the true ones: every data line is the same, and so is the truth's physics.
    expect(a.data).toEqual(plain.data);
    expect(a.truth.physics).toEqual(plain.truth.physics);
    const measured = rigOf(a.rigLine) as unknown as Record<string, number>;
    for (const d of a.truth.measured_rig!.draws) {
      expect(measured[d.key]).toBe(d.measured);
      expect(d.true_value).toBe((sc.rig as unknown as Record<string, number>)[d.key]);
    }
    expect(a.truth.measured_rig!.draws.map((d) => d.key)).toEqual(['length_m', 'flag_width_m', 'bob_diameter_m']);
  });

  it('a scenario may ask for it, and a measured rig of the other kind of pendulum is refused in one line', () => {
    const base = { rig: { length_m: 1, flag_width_m: 0.02 }, duration_s: 10, physics: { g_m_s2: 9.8, release_deg: 10 } };
    expect(scenario({ ...base, measured_rig: true }).measured_rig).toBe(true);
    expect(() => scenario({ ...base, measured_rig: { pendulum: 'reversible', pivot: 1, edge_distance_m: 1, edge_distance_u_m: 0, cm_distance_m: 0.6, cm_distance_u_m: 0, flag_radius_m: 1, flag_width_m: 0.01 } })).toThrow(
      new ScenarioError('scenario.measured_rig must be the same kind of pendulum as scenario.rig'),
    );
  });

  it('a session measures what its runs share once: one flag width, one flag radius per pivot; h1, h2 from one balance point', () => {
    const spec = loadSession('tuning-bar');
    const { runs, truth } = sessionRuns(spec, 7, { measured_rig: true });
    const rigs = runs.map((r) => rigOf(run(r.scenario, r.seed).rigLine) as Extract<AnyRig, { pendulum: 'reversible' }>);
    expect(new Set(rigs.map((r) => r.flag_width_m)).size).toBe(1);
    expect(rigs[0]!.flag_width_m).not.toBe(0.01);
    const radius = (p: 1 | 2): Set<number> => new Set(rigs.filter((r) => r.pivot === p).map((r) => r.flag_radius_m));
    expect(radius(1).size).toBe(1);
    expect(radius(2).size).toBe(1);
    expect([...radius(1)][0]).not.toBe([...radius(2)][0]);
    // Each position's two readings err oppositely: their sum is the true h1 + h2 = l.
    for (let j = 0; j < rigs.length; j += 2) expect(rigs[j]!.cm_distance_m + rigs[j + 1]!.cm_distance_m).toBeCloseTo(truth.edge_distance_m!, 12);
    // The session's own draws (l, the balance points) are those of the session without the measured rig.
    const plain = sessionRuns(spec, 7);
    expect(plain.runs.map((r) => r.scenario.rigid!.cm_distance_m)).toEqual(rigs.map((r) => r.cm_distance_m));
    expect(truth.runs[0]!.measured!.map((d) => d.key)).toEqual(['flag_radius_m', 'flag_width_m']);
  });
});
