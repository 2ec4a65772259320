import { describe, expect, it } from 'vitest';
import { listSessions, loadSession } from '../../sim/outlets/scenario-files.ts';
import { sessionRuns } from '../../sim/session.ts';
import { simulateJournal } from '../../sim/simulate.ts';
import { parseRig } from '../../protocol/rig.ts';

// T = 2π√((k² + h²)/(g h)) for a rigid body (docs/references.md#ref-reversible-pendulum), written out here.
const compound = (h: number, k: number, g: number): number => 2 * Math.PI * Math.sqrt((k * k + h * h) / (g * h));

describe('simulated sessions of several runs', () => {
  it('bundles the two-length, reversible and tuning sessions', () => {
    expect(listSessions()).toEqual(['reversible-bar', 'tuning-bar', 'two-length-carbide']);
  });

  it('two lengths: readings as given, the true lengths one common offset away (each reading off by ~14 µm)', () => {
    const { runs, truth } = sessionRuns(loadSession('two-length-carbide'), 3);
    expect(runs.map((r) => r.scenario.rig.length_m)).toEqual([1.2, 0.6]);
    expect(truth.length_offset_m).toBe(0.006);
    truth.runs.forEach((t, i) => expect(Math.abs(t.true_length_m! - runs[i]!.scenario.rig.length_m - 0.006)).toBeLessThan(1e-4));
    expect(runs[0]!.scenario.rig.length_step_u_m).toBe(2e-5);
  });

  it('reversible: both pivots, opposite balance-point errors, a rig file without length_m, a period ~0.5 ms apart', () => {
    const { runs, truth } = sessionRuns(loadSession('reversible-bar'), 5);
    expect(runs.map((r) => r.scenario.rigid!.pivot)).toEqual([1, 2]);
    const [a, b] = runs.map((r) => r.scenario.rigid!);
    const [ta, tb] = truth.runs;
    expect(a!.cm_distance_m - ta!.true_cm_distance_m!).toBeCloseTo(-(b!.cm_distance_m - tb!.true_cm_distance_m!), 12);
    expect(Math.abs(a!.edge_distance_m - truth.edge_distance_m!)).toBeLessThan(1e-4);
    expect(Math.abs(ta!.true_T0_s - tb!.true_T0_s)).toBeGreaterThan(4e-4);
    expect(Math.abs(ta!.true_T0_s - tb!.true_T0_s)).toBeLessThan(6e-4);
    const { lines } = simulateJournal(runs[0]!.scenario, { seed: 1, durationS: 5 });
    const rigLine = [...lines].find((l) => l.startsWith('#rig '))!;
    const parsed = parseRig(rigLine.slice(5));
    expect(parsed.ok && parsed.rig.pendulum).toBe('reversible');
    expect(rigLine).not.toContain('length_m');
  });

  it('the rigid body swings with T = 2π√((k² + h²)/(g h)): zone crossings of the truth one period apart', () => {
    const { runs } = sessionRuns(loadSession('reversible-bar'), 1);
    const s = runs[1]!.scenario;
    const { lines, truth } = simulateJournal(s, { seed: 2, durationS: 40 });
    for (const _ of lines);
    const T = compound(s.physics.cm_distance_m!, s.physics.gyration_radius_m!, s.physics.g_m_s2);
    expect(truth.physics.T0_s).toBeCloseTo(T, 12);
    const e = truth.passes.enter_s;
    // At 3° the period is longer by ≈ θ²/16 = 1.7e-4; two passes apart is one period.
    const P = (e[e.length - 1]! - e[e.length - 3]!) ;
    expect(P / T - 1).toBeGreaterThan(1.5e-4);
    expect(P / T - 1).toBeLessThan(1.9e-4);
  });

  it('a tuning series: each position on both edges, mass positions in the rigs, the true crossing between them', () => {
    const { runs, truth } = sessionRuns(loadSession('tuning-bar'), 1);
    expect(runs).toHaveLength(8);
    expect(runs.map((r) => r.scenario.rigid!.mass_position_m)).toEqual([0.02, 0.02, 0.03, 0.03, 0.04, 0.04, 0.05, 0.05]);
    expect(truth.crossing_position_m!).toBeGreaterThan(0.03);
    expect(truth.crossing_position_m!).toBeLessThan(0.04);
  });
});
