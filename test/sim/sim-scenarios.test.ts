// The bundled scenario files, scenario validation errors, overrides, and the real-time pacer.
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseRig, rigJson } from '../../protocol/index.ts';
import { applyOverrides, listScenarios, loadScenario, ScenarioError, DEFAULT_SCENARIO, truePhysics } from '../../sim/index.ts';
import { paceLines } from '../../sim/pace.ts';

describe('bundled scenarios', () => {
  it('every file loads and its rig block validates with parseRig', () => {
    const names = listScenarios();
    expect(names).toEqual(expect.arrayContaining(['brass-1m-two-hours', 'club-resonator', 'night-run-faults', DEFAULT_SCENARIO]));
    for (const n of names) {
      const s = loadScenario(n);
      expect(parseRig(rigJson(s.rig)).ok, n).toBe(true);
      expect(s.name).toBe(n);
    }
  });

  it('the demo default decays visibly: Q 100–300 and a release of 30–40°', () => {
    const s = loadScenario(DEFAULT_SCENARIO);
    expect(s.physics.linear_q).toBeGreaterThanOrEqual(100);
    expect(s.physics.linear_q).toBeLessThanOrEqual(300);
    expect(s.physics.release_deg).toBeGreaterThanOrEqual(30);
    expect(s.physics.release_deg).toBeLessThanOrEqual(40);
  });

  it('an unknown name or a bad file gives a one-line ScenarioError that says what to fix', () => {
    expect(() => loadScenario('no-such-rig')).toThrow(ScenarioError);
    expect(() => loadScenario('no-such-rig')).toThrow(/unknown scenario "no-such-rig" \(known: .*demo-low-q/);
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-sim-'));
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ rig: { length_m: 1, flag_width_m: 0.02 }, duration_s: 10, physics: { g_m_s2: 9.8, release_deg: 10, lenght: 2 } }));
    expect(() => loadScenario(bad)).toThrow(/scenario\.physics\.lenght is not a known key/);
    writeFileSync(bad, JSON.stringify({ rig: { length_m: 1, flag_wdth_m: 0.02 }, duration_s: 10, physics: { g_m_s2: 9.8, release_deg: 10 } }));
    expect(() => loadScenario(bad)).toThrow(/unknown rig key "flag_wdth_m"/);
    writeFileSync(bad, '{ not json');
    expect(() => loadScenario(bad)).toThrow(/not valid JSON/);
    try {
      loadScenario(bad);
    } catch (e) {
      expect((e as Error).message).not.toContain('\n');
    }
  });

  it('overrides change the truth and are validated again', () => {
    const s = loadScenario('club-resonator');
    const o = applyOverrides(s, { length_m: 0.8, ppm: -50, release_deg: 20, no_faults: true });
    expect(truePhysics(o).length_m).toBe(0.8);
    expect(o.device.ppm).toBe(-50);
    expect(() => applyOverrides(s, { release_deg: 0.5 })).toThrow(ScenarioError);
  });
});

describe('paceLines', () => {
  it('releases each line at host time / speed on an injected clock; headers at once; abort stops', async () => {
    let now = 1000;
    const waits: number[] = [];
    const sleep = async (ms: number) => {
      waits.push(ms);
      now += ms;
    };
    const lines = ['#halfswing-journal 1', '#start 2026-01-01T00:00:00.000Z', '#@0 connect x', '500000 T 1 0 0 1 *00', '2000000 E 2 0 f 9 *00', '#@3000000 note y'];
    const out: string[] = [];
    for await (const l of paceLines(lines, { speed: 10, now: () => now, sleep })) out.push(l);
    expect(out).toEqual(lines);
    expect(waits).toEqual([50, 150, 100]);
    const ac = new AbortController();
    const got: string[] = [];
    for await (const l of paceLines(lines, { speed: 1, now: () => now, sleep: async () => ac.abort(), signal: ac.signal })) got.push(l);
    expect(got).toEqual(lines.slice(0, 3));
  });
});
