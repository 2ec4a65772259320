import { describe, expect, it } from 'vitest';
import { fitDamping, qualityFactor } from '../../host/analysis/damping.ts';
import { periodRatio } from '../../host/analysis/elliptic.ts';
import { fitPeriodLaw } from '../../host/analysis/period-law.ts';
import { TestRng } from './seeded-rng.ts';

const T = 2.0064;
const DEG = Math.PI / 180;

/** Amplitudes at every half-period from a closed-form law, with a little measurement noise. */
function series(law: (t: number) => number, seconds: number, noiseRad: number, seed: number) {
  const rng = new TestRng(seed);
  const t: number[] = [];
  const a: number[] = [];
  for (let s = 0; s < seconds; s += T / 2) t.push(s), a.push(law(s) + noiseRad * rng.normal());
  return { t, a };
}

describe('damping laws (docs/references.md#ref-damping; Squire, Am. J. Phys. 54, 984 (1986))', () => {
  it('linear: per-cycle ratio e^(−π/1000) = 0.996863337 gives Q = 1000 and the linear model', () => {
    const a1 = -Math.log(0.996863337) / T;
    const { t, a } = series((s) => 0.2 * Math.exp(-a1 * s), 4000, 2e-6, 1);
    const d = fitDamping(t, a, T)!;
    expect(d.best.model).toBe('linear');
    expect(d.Q).toBeCloseTo(1000, -1);
    expect(d.tau_s).toBeCloseTo(1 / a1, -1);
  });

  it('quadratic: Δ(1/A) = (8/3)(cL/M) = 0.026667 per cycle at cL/M = 0.01, Q = 3πM/(8cLA)', () => {
    const per = (8 / 3) * 0.01;
    const { t, a } = series((s) => 1 / (1 / 0.3 + (per * s) / T), 3000, 2e-6, 2);
    const d = fitDamping(t, a, T)!;
    expect(['quadratic', 'mixed']).toContain(d.best.model);
    const fitQ = qualityFactor(d.best, 0.1, T);
    expect(fitQ / ((3 * Math.PI) / (8 * 0.01 * 0.1))).toBeCloseTo(1, 2);
  });

  it('constant (Coulomb) friction: ΔA = 4θ_f per cycle at θ_f = 1e-4, Q = πA/(4θ_f)', () => {
    const { t, a } = series((s) => 0.2 - (4e-4 * s) / T, 600, 2e-6, 3);
    const d = fitDamping(t, a, T)!;
    expect(['constant', 'mixed']).toContain(d.best.model);
    expect(qualityFactor(d.best, 0.15, T) / ((Math.PI * 0.15) / 4e-4)).toBeCloseTo(1, 2);
  });

  it('a mix of linear and quadratic loss is told apart from each alone', () => {
    // dA/dt = −(a1 A + a2 A²), integrated exactly: A = a1 / ((a1/A0 + a2) e^{a1 t} − a2).
    const a1 = 2e-4;
    const a2 = 2e-3;
    const { t, a } = series((s) => a1 / ((a1 / 0.5 + a2) * Math.exp(a1 * s) - a2), 8000, 1e-6, 4);
    const d = fitDamping(t, a, T)!;
    expect(d.best.model).toBe('mixed');
    expect(d.best.a1).toBeCloseTo(a1, 5);
    expect(d.best.a2 / a2).toBeCloseTo(1, 1);
  });

  it('returns null for too few swings', () => {
    expect(fitDamping([0, 1, 2], [0.1, 0.1, 0.1], T)).toBeNull();
  });
});

describe('fit of T = T0(1 + Bθ0² + Cθ0⁴)', () => {
  it('periods of the exact law from 60° to 3° give B = 1/16 and C = 11/3072', () => {
    const rng = new TestRng(5);
    const P: number[] = [];
    const A: number[] = [];
    for (let k = 0; k < 3000; k++) {
      const th = (60 - (57 * k) / 3000) * DEG;
      A.push(th);
      P.push(T * periodRatio(th) + 3e-6 * rng.normal());
    }
    const f = fitPeriodLaw(P, A)!;
    expect(f.T0).toBeCloseTo(T, 6);
    expect(Math.abs(f.B - 1 / 16)).toBeLessThan(4 * f.B_u);
    expect(Math.abs(f.C! - 11 / 3072)).toBeLessThan(4 * f.C_u!);
    expect(f.B_u / f.B).toBeLessThan(1e-3);
  });

  it('a rig that departs from the simple law shows it in B', () => {
    const P: number[] = [];
    const A: number[] = [];
    for (let k = 0; k < 500; k++) {
      const th = (30 - (27 * k) / 500) * DEG;
      A.push(th);
      P.push(T * (periodRatio(th) + 0.01 * th * th));
    }
    expect(fitPeriodLaw(P, A)!.B).toBeCloseTo(1 / 16 + 0.01, 6);
  });

  it('below 20° C is not fitted, and too few periods give null', () => {
    const A = Array.from({ length: 100 }, (_, k) => (10 - k * 0.05) * DEG);
    const f = fitPeriodLaw(A.map((th) => T * periodRatio(th)), A)!;
    expect(f.C).toBeNull();
    expect(f.B).toBeCloseTo(1 / 16, 7);
    expect(fitPeriodLaw([2, 2, 2], [0.1, 0.1, 0.1])).toBeNull();
  });
});
