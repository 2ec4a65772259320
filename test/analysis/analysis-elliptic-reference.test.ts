import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import ellipk from '@stdlib/math-base-special-ellipk';
import { AS_TABLE_17_1_K, PERIOD_RATIO_TABLE } from '../reference/elliptic-tables.ts';
import { agm, carlsonRF, ellipticF, ellipticK, periodRatio, PERIOD_SERIES } from '../../host/analysis/elliptic.ts';

const DEG = Math.PI / 180;

describe('complete elliptic integral K(m) by the AGM', () => {
  const table = AS_TABLE_17_1_K;
  it.each(table)('K(%f) matches A&S Table 17.1', (m, k) => {
    expect(ellipticK(m)).toBeCloseTo(k, 13);
  });

  it('K(1/2) = Γ(1/4)²/(4√π), the lemniscatic case (from memory; 20 digits in docs/references.md#ref-elliptic-k)', () => {
    expect(ellipticK(0.5)).toBeCloseTo(1.8540746773013719184, 14);
  });

  it('K(sin²75°)/K(sin²15°) = √3, a singular-value relation (from memory)', () => {
    expect(ellipticK(Math.sin(75 * DEG) ** 2) / ellipticK(Math.sin(15 * DEG) ** 2)).toBeCloseTo(Math.sqrt(3), 13);
  });

  it('agrees with @stdlib/math-base-special-ellipk over m in [0, 0.999]', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.999, noNaN: true }), (m) => {
        expect(Math.abs(ellipticK(m) - ellipk(m)) / ellipk(m)).toBeLessThan(1e-14);
      }),
    );
  });

  it('agm is symmetric and lies between the geometric and arithmetic means', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e3, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (a, b) => {
        const m = agm(a, b);
        expect(Math.abs(m - agm(b, a))).toBeLessThanOrEqual(1e-14 * m);
        expect(m).toBeGreaterThanOrEqual(Math.sqrt(a * b) * (1 - 1e-15));
        expect(m).toBeLessThanOrEqual(((a + b) / 2) * (1 + 1e-15));
      }),
    );
  });
});

describe('large-amplitude period ratio T/T0 = 2K(sin²(θ0/2))/π = 1/AGM(1, cos(θ0/2))', () => {
  const table = PERIOD_RATIO_TABLE;
  it.each(table)('θ0 = %f°', (deg, ratio) => {
    expect(periodRatio(deg * DEG)).toBeCloseTo(ratio, 13);
  });

  it('matches the series 1 + θ²/16 + 11θ⁴/3072 + 173θ⁶/737280 at small angles (OEIS A223067/A223068)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.2, noNaN: true }), (th) => {
        const series = 1 + th ** 2 / 16 + (11 * th ** 4) / 3072 + (173 * th ** 6) / 737280;
        // The next term, 22931θ⁸/1321205760, bounds the truncation error.
        expect(Math.abs(periodRatio(th) - series)).toBeLessThan(2e-5 * th ** 8 + 5e-16);
      }),
    );
    expect(PERIOD_SERIES.slice(0, 4)).toEqual([1, 1 / 16, 11 / 3072, 173 / 737280]);
  });

  it('truncation errors of the series at 10°, 30°, 60° (docs/references.md#ref-period-ratio)', () => {
    const trunc = (th: number, terms: number): number => PERIOD_SERIES.slice(0, terms).reduce((s, c, i) => s + c * th ** (2 * i), 0);
    expect(trunc(10 * DEG, 2) - periodRatio(10 * DEG)).toBeCloseTo(-3.3293e-6, 9);
    expect(trunc(30 * DEG, 3) - periodRatio(30 * DEG)).toBeCloseTo(-4.9353e-6, 9);
    expect(trunc(60 * DEG, 4) - periodRatio(60 * DEG)).toBeCloseTo(-2.752e-5, 8);
  });

  it('common practice, no source: at 57° (1 rad) the θ²/16 term alone is about 6 %, and the textbook 4°–5° limit keeps the error under 0.05 %', () => {
    expect(1 / 16).toBeCloseTo(0.0625, 12);
    expect(periodRatio(1) - 1).toBeGreaterThan(0.06);
    expect(periodRatio(1) - 1).toBeLessThan(0.07);
    expect(periodRatio(5 * DEG) - 1).toBeLessThan(5e-4);
    expect(periodRatio(4 * DEG) - 1).toBeGreaterThan(3e-4);
  });
});

describe("Carlson's R_F and the incomplete integral F(φ|m)", () => {
  it('F(π/2|m) = K(m), F(φ|0) = φ, R_F(x,x,x) = 1/√x (DLMF 19.25.5, 19.20.1)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.99, noNaN: true }), fc.double({ min: 0, max: Math.PI / 2, noNaN: true }), (m, phi) => {
        expect(ellipticF(Math.PI / 2, m)).toBeCloseTo(ellipticK(m), 13);
        expect(ellipticF(phi, 0)).toBeCloseTo(phi, 14);
      }),
    );
    expect(carlsonRF(4, 4, 4)).toBeCloseTo(0.5, 15);
  });

  it('agrees with a 64-point Gauss–Legendre quadrature of ∫₀^φ (1 − m sin²t)^(-1/2) dt', () => {
    // Nodes by Newton on the Legendre polynomial: independent of the AGM and of Carlson's algorithm.
    const N = 64;
    const nodes: number[] = [];
    const weights: number[] = [];
    for (let i = 1; i <= N; i++) {
      let x = Math.cos((Math.PI * (i - 0.25)) / (N + 0.5));
      let dp = 0;
      for (let it = 0; it < 100; it++) {
        let p0 = 1;
        let p1 = x;
        for (let k = 2; k <= N; k++) [p0, p1] = [p1, ((2 * k - 1) * x * p1 - (k - 1) * p0) / k];
        dp = (N * (x * p1 - p0)) / (x * x - 1);
        const dx = p1 / dp;
        x -= dx;
        if (Math.abs(dx) < 1e-16) break;
      }
      nodes.push(x);
      weights.push(2 / ((1 - x * x) * dp * dp));
    }
    const gl = (phi: number, m: number): number => nodes.reduce((s, x, i) => s + weights[i]! / Math.sqrt(1 - m * Math.sin((phi / 2) * (x + 1)) ** 2), 0) * (phi / 2);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.9, noNaN: true }), fc.double({ min: 0.01, max: Math.PI / 2, noNaN: true }), (m, phi) => {
        expect(Math.abs(ellipticF(phi, m) - gl(phi, m))).toBeLessThan(1e-12);
      }),
    );
  });
});
