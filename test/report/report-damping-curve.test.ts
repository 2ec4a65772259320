import { describe, expect, it } from 'vitest';
import { dampingCurve, qOfAmplitude } from '../../host/report/plots/damping-curve.ts';
import type { DampingFit } from '../../host/analysis/result.ts';

const fit = (a0: number, a1: number, a2: number): DampingFit => ({ model: 'mixed', score: 0, a0, a1, a2, rms_residual_deg: 0 });
const DEG = Math.PI / 180;

// Closed-form solutions of dA/dt = −(a0 + a1·A + a2·A²) for one term at a time (elementary ODEs).
describe('damping curve drawn from a fit', () => {
  it('linear loss decays exponentially: A = A0·e^(−a1·t)', () => {
    const c = dampingCurve(fit(0, 1 / 500, 0), 0, 30, 2000, 50);
    c.t_s.forEach((t, i) => expect(c.amplitude_deg[i]!).toBeCloseTo(30 * Math.exp(-t / 500), 8));
  });

  it('quadratic loss makes 1/A grow linearly: 1/A = 1/A0 + a2·t', () => {
    const c = dampingCurve(fit(0, 0, 0.01), 10, 20, 1010, 40);
    c.t_s.forEach((t, i) => expect(1 / (c.amplitude_deg[i]! * DEG)).toBeCloseTo(1 / (20 * DEG) + 0.01 * (t - 10), 6));
  });

  it('constant friction decays linearly and stops at zero', () => {
    const a0 = (10 * DEG) / 100; // 10° in 100 s
    const c = dampingCurve(fit(a0, 0, 0), 0, 10, 300, 301);
    expect(c.amplitude_deg[50]!).toBeCloseTo(5, 9);
    expect(c.t_s.at(-1)!).toBeLessThan(101.5);
    expect(c.amplitude_deg.at(-1)!).toBe(0);
  });

  it('Q of exponential decay is π·τ/T0 at every amplitude (Q = π·A/ΔA per cycle)', () => {
    for (const a of [2, 10, 30]) expect(qOfAmplitude(fit(0, 1 / 900, 0), 2, a)).toBeCloseTo((Math.PI * 900) / 2, 9);
    expect(qOfAmplitude(fit(0, 0, 0), 2, 10)).toBeNaN();
  });
});
