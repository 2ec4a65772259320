// The gate's on/off delay difference calibrated from the run: periods against the exact law
// (docs/references.md#ref-period-ratio, #ref-gate-delay), checked against exact synthetic swings and the simulator's truth.
import { describe, expect, it } from 'vitest';
import { amplitudeSlopePerTransit, fitDelayDifference, gateDelay } from '../../host/analysis/delay-fit.ts';
import { periodRatio } from '../../host/analysis/elliptic.ts';
import { warningText } from '../../host/output/warning-words.ts';
import { amplitudeFromTransit, blockHalfAngle, harmonicAmplitude, transitTime } from '../../host/analysis/transit-amplitude.ts';
import { scenario, simAndAnalyze, truthAmplitudeAt } from '../pipeline/sim-run.ts';
import { TestRng } from './seeded-rng.ts';

const DEG = 180 / Math.PI;

describe('fitDelayDifference on exact swings', () => {
  it('recovers a 30 µs difference from periods of the exact law and transits shortened by it', () => {
    const T0 = 2.00640929259; // L = 1 m at g_n (docs/references.md#ref-period-ratio)
    const w0 = (2 * Math.PI) / T0;
    const phiB = blockHalfAngle(0.0254, 1);
    const delta = 30e-6;
    const rng = new TestRng(11);
    const n = 400;
    const P: number[] = [];
    const th: number[] = [];
    const sl: number[] = [];
    for (let k = 0; k < n; k++) {
      const theta = (40 - (30 * k) / n) * (Math.PI / 180);
      P.push(T0 * periodRatio(theta) + 1e-6 * rng.normal());
      // The sensor turns on late by Δ more than it turns off: each measured transit is Δ short.
      const tm = transitTime(theta, phiB, w0) - delta;
      th.push(amplitudeFromTransit(tm, phiB, w0));
      sl.push(amplitudeSlopePerTransit(tm, phiB, w0));
    }
    const f = fitDelayDifference(P, th, sl, new Uint8Array(n).fill(1), 0)!;
    // One linear step from 0: the line is exact at its trial value only, so allow 1 % of Δ; the noise is ~0.1 µs.
    expect(Math.abs(f.delta_s - delta)).toBeLessThan(0.3e-6 + 0.01 * delta);
    expect(f.u_s).toBeLessThan(0.5e-6);
  });

  it('the slope of the harmonic form matches the exact inverse to 1e-3', () => {
    const w0 = (2 * Math.PI) / 2.0064;
    const phiB = blockHalfAngle(0.0254, 1);
    for (const deg of [5, 20, 45, 60]) {
      const tau = transitTime(deg / DEG, phiB, w0);
      const h = tau * 1e-5;
      const exact = (amplitudeFromTransit(tau + h, phiB, w0) - amplitudeFromTransit(tau - h, phiB, w0)) / (2 * h);
      expect(Math.abs(amplitudeSlopePerTransit(tau, phiB, w0) / exact - 1)).toBeLessThan(1e-3);
      expect(harmonicAmplitude(tau, phiB, w0)).toBeCloseTo(deg / DEG, 5);
    }
  });

  it('without a fit the prior is used; with one, the inverse-variance mean', () => {
    expect(gateDelay(null, 0, 5e-6)).toMatchObject({ difference_s: 0, difference_u_s: 5e-6, source: 'prior' });
    const g = gateDelay({ delta_s: 40e-6, u_s: 1e-6, batches: 20 }, 0, 5e-6);
    expect(g.difference_s).toBeCloseTo((40e-6 * 1) / (1 + 1 / 25), 12);
    expect(g.source).toBe('run');
  });
});

describe('the delay calibrated from a simulated run (simulator truth)', () => {
  it('10 minutes from 45° with a 40 µs on/off difference: the delay within its uncertainty, amplitudes within 0.02°', () => {
    // The case: before the calibration the amplitudes read 0.2° low at 45°.
    const sc = scenario({
      name: 'delay-40us',
      // The ball's diameter read to 20 µm: a flag-width error is taken by the fit for a delay (~0.4 µs per µm here).
      rig: { length_m: 1, flag_width_m: 0.0254, flag_width_u_m: 2e-5, bob_diameter_m: 0.0254 },
      duration_s: 600,
      physics: { g_m_s2: 9.80665, release_deg: 45, linear_q: 300 },
      gate: { offset_m: 0, blocking_delay_us: 2, unblocking_delay_us: 42, jitter_us: 1 },
    });
    const { truth, result: r } = simAndAnalyze(sc, { seed: 1 });
    const d = r.gate_delay!;
    expect(d.source).toBe('run');
    expect(Math.abs(d.difference_s - -40e-6)).toBeLessThan(2 * d.difference_u_s);
    expect(d.statistical_u_s).toBeLessThan(0.2e-6);
    expect(d.difference_u_s).toBeLessThan(10e-6);
    let worst = 0;
    for (const s of r.swings) if (s.amplitude_deg !== null) worst = Math.max(worst, Math.abs(s.amplitude_deg - truthAmplitudeAt(truth, s.t_s) * DEG));
    expect(worst).toBeLessThan(0.02);
    expect(r.amplitude_start_u_deg!).toBeGreaterThan(0);
    // B of the exact law (1/16) within two of its standard uncertainties, which now carry the flag width's term.
    expect(Math.abs(r.B! - 1 / 16)).toBeLessThan(2 * r.B_u!);
    expect(r.derived_u!.B!.flag_width).toBeGreaterThan(r.derived_u!.B!.statistics);
  });

  it('a run whose amplitude barely changes keeps the assumed delay and says so', () => {
    const sc = scenario({ name: 'narrow', rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 }, duration_s: 300, physics: { g_m_s2: 9.80665, release_deg: 10 } });
    const { result: r } = simAndAnalyze(sc, { seed: 2 });
    expect(r.gate_delay!.source).toBe('prior');
    expect(Math.abs(r.gate_delay!.difference_s)).toBeLessThan(0.5e-6);
    const w = r.warnings.find((x) => x.kind === 'gate-delay-prior');
    expect(w && warningText(w)).toMatch(/gate delay: the run's amplitude range is too narrow to calibrate the sensor's on\/off delay difference/);
  });
});
