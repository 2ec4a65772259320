import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  amplitudeFromTransit,
  amplitudeSensitivity,
  blockHalfAngle,
  harmonicAmplitude,
  naiveAmplitude,
  transitTime,
} from '../../host/analysis/transit-amplitude.ts';

const DEG = Math.PI / 180;
// docs/references.md#ref-transit-amplitude: L = 1 m, d = 2r = 25.4 mm, g = 9.80665 m/s²; Δt_exact by quadrature of
// 2∫₀^φb dφ/√(2ω0²(cos φ − cos θ0)) (derived there, checked numerically; no published source).
const L = 1;
const W = 0.0254;
const OMEGA0 = Math.sqrt(9.80665 / L);
const PHI_B = blockHalfAngle(W, L);
const TABLE: [number, number, number, number][] = [
  // θ0 (deg), Δt exact (s), θ0 from naive d/v_max (deg), θ0 from the harmonic closed form (deg)
  [1, 0.520469497, 0.8929, 1.000001],
  [2, 0.2378399751, 1.95403, 2.0000004],
  [5, 0.09330858753, 4.98209, 5.0000001],
  [10, 0.04657405431, 9.99085, 10.00000007],
  [30, 0.01567120564, 29.99609, 30.00000002],
];

describe('transit time of a pendulum through a beam at the bottom (exact, by Carlson R_F)', () => {
  it.each(TABLE)('θ0 = %f°: exact transit, and the amplitude solved back from it', (deg, dt, naive, harmonic) => {
    expect(transitTime(deg * DEG, PHI_B, OMEGA0)).toBeCloseTo(dt, 10);
    // The exact inverse recovers θ0 to the table's precision (its Δt has 10 significant digits).
    expect(amplitudeFromTransit(dt, PHI_B, OMEGA0) / DEG).toBeCloseTo(deg, 7);
    // The approximations, for contrast: the naive v = w/τ is off by 10.7 % at 1°; the harmonic form by 1e-6.
    expect(naiveAmplitude(dt, PHI_B, OMEGA0) / DEG).toBeCloseTo(naive, 4);
    expect(harmonicAmplitude(dt, PHI_B, OMEGA0) / DEG).toBeCloseTo(harmonic, 6);
  });

  it('amplitudeFromTransit inverts transitTime from just above the beam to 170° (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.001, max: (170 * DEG) / PHI_B, noNaN: true }), fc.double({ min: 0.5, max: 20, noNaN: true }), (ratio, w0) => {
        const th = ratio * PHI_B;
        const back = amplitudeFromTransit(transitTime(th, PHI_B, w0), PHI_B, w0);
        expect(Math.abs(back - th)).toBeLessThan(1e-9 * th);
      }),
    );
  });

  it('agrees with adaptive Simpson quadrature of the defining integral (independent of R_F)', () => {
    const integrand = (phi: number, th: number): number => 1 / Math.sqrt(2 * OMEGA0 ** 2 * (Math.cos(phi) - Math.cos(th)));
    const simpson = (f: (x: number) => number, a: number, b: number, eps: number, whole: number, depth: number): number => {
      const m = (a + b) / 2;
      const left = ((m - a) / 6) * (f(a) + 4 * f((a + m) / 2) + f(m));
      const right = ((b - m) / 6) * (f(m) + 4 * f((m + b) / 2) + f(b));
      if (depth <= 0 || Math.abs(left + right - whole) < 15 * eps) return left + right + (left + right - whole) / 15;
      return simpson(f, a, m, eps / 2, left, depth - 1) + simpson(f, m, b, eps / 2, right, depth - 1);
    };
    for (const deg of [2, 3, 7, 15, 45, 60, 90]) {
      const th = deg * DEG;
      const f = (x: number): number => integrand(x, th);
      const whole = (PHI_B / 6) * (f(0) + 4 * f(PHI_B / 2) + f(PHI_B));
      const q = 2 * simpson(f, 0, PHI_B, 1e-15, whole, 40);
      expect(Math.abs(transitTime(th, PHI_B, OMEGA0) - q) / q).toBeLessThan(1e-11);
    }
  });

  it('has no amplitude for impossible transits (zero, negative, or longer than a swing that just clears the beam)', () => {
    expect(amplitudeFromTransit(0, PHI_B, OMEGA0)).toBeNaN();
    expect(amplitudeFromTransit(-1, PHI_B, OMEGA0)).toBeNaN();
    expect(amplitudeFromTransit(10, PHI_B, OMEGA0)).toBeNaN();
    expect(transitTime(PHI_B * 0.9, PHI_B, OMEGA0)).toBe(Infinity);
  });

  it('sensitivities: θ0 grows about in proportion to w, and falls as τ grows (delay difference shortens τ)', () => {
    const tau = transitTime(10 * DEG, PHI_B, OMEGA0);
    const s = amplitudeSensitivity(tau, W, L, OMEGA0);
    // For θ0 ≫ φb, θ0 ∝ w, so dθ0/dw ≈ θ0/w; and θ0 ∝ 1/τ roughly, so dθ0/dτ ≈ −θ0/τ (both within a few %).
    expect(s.dTheta_dWidth_rad_per_m / ((10 * DEG) / W)).toBeGreaterThan(0.98);
    expect(s.dTheta_dWidth_rad_per_m / ((10 * DEG) / W)).toBeLessThan(1.02);
    expect(s.dTheta_dTransit_rad_per_s / (-(10 * DEG) / tau)).toBeGreaterThan(0.97);
    expect(s.dTheta_dTransit_rad_per_s / (-(10 * DEG) / tau)).toBeLessThan(1.03);
  });
});
