import { describe, expect, it } from 'vitest';
import { parseSimpleRig, type Rig } from '../../protocol/rig.ts';
import { loadScenario } from '../../sim/index.ts';
import { TestRng } from '../analysis/seeded-rng.ts';
import { scenario, simAndAnalyze, truthAmplitudeAt } from './sim-run.ts';

const DEG = 180 / Math.PI;
const rigOf = (v: unknown): Rig => {
  const r = parseSimpleRig(v);
  if (!r.ok) throw new Error(r.error);
  return r.rig;
};

describe('against the simulator truth', () => {
  it('g lies within its k = 2 uncertainty across many seeds, with coverage near 95 %', () => {
    // The user measures L and w with the rig's stated standard uncertainties; the simulated bob has the true values.
    const brass = loadScenario('brass-1m-two-hours');
    const seeds = 40;
    let gInside = 0;
    let tInside = 0;
    for (let seed = 1; seed <= seeds; seed++) {
      const rng = new TestRng(1000 + seed);
      const sc = scenario({ ...brass, rig: { ...brass.rig }, duration_s: 900, device: { ...brass.device, ppm: (rng.uniform() - 0.5) * 400 } });
      const measured = rigOf({ ...sc.rig, length_m: sc.rig.length_m + sc.rig.length_u_m * rng.normal(), flag_width_m: sc.rig.flag_width_m + sc.rig.flag_width_u_m * rng.normal() });
      const { truth, result: r } = simAndAnalyze(sc, { seed }, { rig: measured });
      if (Math.abs(r.g_m_s2! - truth.physics.g_m_s2) < 2 * r.g_u_m_s2!) gInside++;
      if (Math.abs(r.T0_s! - truth.physics.T0_s) < 2 * r.T0_u_s!) tInside++;
    }
    console.log(`measured coverage of the k = 2 intervals over ${seeds} seeds: g ${((100 * gInside) / seeds).toFixed(1)} %, T0 ${((100 * tInside) / seeds).toFixed(1)} %`);
    // With 40 seeds a true 95 % coverage gives ≥ 34 inside with probability 0.99 (binomial).
    expect(gInside).toBeGreaterThanOrEqual(34);
    expect(tInside).toBeGreaterThanOrEqual(34);
  });

  it('T0 from timing alone is efficient and its stated uncertainty covers (least-squares bound, docs/references.md#ref-timing-statistics)', () => {
    // Only pass-time jitter: 20 µs per edge, exact clock (given as 0 ppm), w known to 0.1 µm, no delays.
    const sc = scenario({
      name: 'timing-only',
      rig: { length_m: 1, flag_width_m: 0.025, flag_width_u_m: 1e-7, bob_diameter_m: 0.025 },
      duration_s: 120,
      physics: { g_m_s2: 9.80665, release_deg: 3 },
      gate: { offset_m: 0.0007, blocking_delay_us: 0, unblocking_delay_us: 0, jitter_us: 20 },
    });
    const errs: number[] = [];
    let inside = 0;
    let n = 0;
    let u = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const { truth, result: r } = simAndAnalyze(sc, { seed }, { clock: 0 });
      errs.push(r.T0_s! - truth.physics.T0_s);
      if (Math.abs(r.T0_s! - truth.physics.T0_s) < 2 * r.T0_u_s!) inside++;
      n = r.passes;
      u += r.T0_u_s! / 40;
    }
    const sd = Math.sqrt(errs.reduce((a, e) => a + e * e, 0) / errs.length);
    // σ_T0 ≥ 2σ_pass√(12/(N(N²−1)))/r(θ0), σ_pass = 20 µs/√2 (OLS slope bound, Bevington & Robinson ch. 6, from memory).
    const bound = (2 * (20e-6 / Math.SQRT2) * Math.sqrt(12 / (n * (n * n - 1)))) / 1.000171;
    console.log(`timing-only T0: rms error ${(sd * 1e9).toFixed(1)} ns, LS bound ${(bound * 1e9).toFixed(1)} ns, mean stated u ${(u * 1e9).toFixed(1)} ns, coverage ${((100 * inside) / 40).toFixed(1)} %`);
    expect(sd).toBeLessThan(1.5 * bound);
    expect(u).toBeLessThan(2 * bound);
    expect(inside).toBeGreaterThanOrEqual(34);
  });

  it('g coverage holds when L is known to 1 µm, so timing, clock, amplitude reduction and corrections dominate', () => {
    const brass = loadScenario('brass-1m-two-hours');
    const seeds = 40;
    let inside = 0;
    let z2 = 0;
    for (let seed = 1; seed <= seeds; seed++) {
      const rng = new TestRng(5000 + seed);
      const sc = scenario({ ...brass, rig: { ...brass.rig, length_u_m: 1e-6 }, duration_s: 900, device: { ...brass.device, ppm: (rng.uniform() - 0.5) * 400 } });
      const measured = rigOf({ ...sc.rig, length_m: sc.rig.length_m + 1e-6 * rng.normal(), flag_width_m: sc.rig.flag_width_m + sc.rig.flag_width_u_m * rng.normal() });
      const { truth, result: r } = simAndAnalyze(sc, { seed }, { rig: measured });
      const z = (r.g_m_s2! - truth.physics.g_m_s2) / r.g_u_m_s2!;
      z2 += z * z;
      if (Math.abs(z) < 2) inside++;
    }
    const rms = Math.sqrt(z2 / seeds);
    console.log(`L known to 1 µm: coverage of g ± 2u ${((100 * inside) / seeds).toFixed(1)} %, rms of (g − g_true)/u ${rms.toFixed(2)} (1 when the budget is right)`);
    expect(inside).toBeGreaterThanOrEqual(34);
    // Not grossly conservative either: the budget is meant to be right, not safe.
    expect(rms).toBeGreaterThan(0.5);
  });

  it.each([3, 10, 30, 60])('amplitude per swing within 0.05° at %f° when w is exact', (deg) => {
    const sc = scenario({
      name: `amp-${deg}`,
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 120,
      physics: { g_m_s2: 9.80665, release_deg: deg, linear_q: 3000 },
      gate: { offset_m: 0, blocking_delay_us: 4, unblocking_delay_us: 4, jitter_us: 1 },
    });
    const { truth, result: r } = simAndAnalyze(sc, { seed: deg }, { clock: 'nominal' });
    let n = 0;
    for (const s of r.swings) {
      if (s.amplitude_deg === null) continue;
      n++;
      expect(Math.abs(s.amplitude_deg - truthAmplitudeAt(truth, s.t_s) * DEG)).toBeLessThan(0.05);
    }
    expect(n).toBeGreaterThan(100);
  });

  it('amplitude within 0.05° through a decay from 60° to 3°', () => {
    const sc = scenario({
      name: 'amp-decay',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 560,
      physics: { g_m_s2: 9.80665, release_deg: 60, linear_q: 300 },
      gate: { offset_m: 0, blocking_delay_us: 4, unblocking_delay_us: 4, jitter_us: 1 },
    });
    const { truth, result: r } = simAndAnalyze(sc, { seed: 9 });
    let worst = 0;
    for (const s of r.swings) {
      if (s.amplitude_deg === null || s.amplitude_deg < 3) continue;
      worst = Math.max(worst, Math.abs(s.amplitude_deg - truthAmplitudeAt(truth, s.t_s) * DEG));
    }
    expect(r.amplitude_start_deg!).toBeGreaterThan(59);
    expect(r.amplitude_end_deg!).toBeLessThan(3.5);
    expect(worst).toBeLessThan(0.05);
  });

  it('clock rate within 2 ppm from a 2-hour run with realistic USB latency', () => {
    const sc = loadScenario('brass-1m-two-hours');
    const { truth, result: r } = simAndAnalyze(sc, { seed: 5 });
    // The device drifts linearly; the run's mean rate is the rate at mid-run.
    const mean = truth.clock.ppm + (truth.clock.drift_ppm_per_h * sc.duration_s) / 2 / 3600;
    expect(r.clock_source).toBe('host');
    expect(Math.abs(r.clock_ppm! - mean)).toBeLessThan(2);
    expect(Math.abs(r.clock_ppm! - mean)).toBeLessThan(Math.max(4 * r.clock_u_ppm!, 0.05));
    expect(r.clock_drift_ppm_per_h!).toBeCloseTo(truth.clock.drift_ppm_per_h, 0);
  });

  it.each([0.0004, -0.0015, 0.003])('gate offset %f m recovered within 0.2 mm, with its sign', (offset) => {
    const brass = loadScenario('brass-1m-two-hours');
    const { result: r } = simAndAnalyze(brass, { seed: 2, durationS: 600, gate_offset_m: offset });
    expect(Math.abs(r.gate_offset_m! - offset)).toBeLessThan(2e-4);
    expect(Math.abs(r.gate_offset_m! - offset)).toBeLessThan(2e-5);
  });

  it('B within 3 % of 1/16 over a 30° → 3° decay', () => {
    const sc = scenario({
      name: 'b-decay',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 600,
      physics: { g_m_s2: 9.80665, release_deg: 30, linear_q: 400 },
    });
    const { result: r } = simAndAnalyze(sc, { seed: 4 });
    expect(r.amplitude_start_deg!).toBeGreaterThan(29.5);
    expect(r.amplitude_end_deg!).toBeLessThan(3.2);
    expect(Math.abs(r.B! * 16 - 1)).toBeLessThan(0.03);
    expect(r.C).not.toBeNull();
  });

  it('a swing that dies out behind an offset beam is left out without blame, not taken for objects', () => {
    // club-resonator: no faults; the amplitude decays until the bob no longer clears the beam on one side.
    const sc = loadScenario('club-resonator');
    const { truth, result: r } = simAndAnalyze(sc, { seed: 1 });
    expect(truth.faults.counts.objects).toBe(0);
    expect(r.counts.rejected_passes).toBe(0);
    expect(r.counts.long_gaps).toBe(0);
    expect(r.counts.unsequenced_passes!).toBeGreaterThan(10);
    expect(r.warnings.some((w) => /no longer cleared the beam/.test(w))).toBe(true);
    // A resonator 3000 ppm fast drifting 20 ppm/h: the run's mean rate is the mid-run rate.
    expect(Math.abs(r.clock_ppm! - (truth.clock.ppm + (truth.clock.drift_ppm_per_h * sc.duration_s) / 2 / 3600))).toBeLessThan(2);
    expect(Math.abs(r.gate_offset_m! - truth.gate.offset_m)).toBeLessThan(2e-4);
  });
});
