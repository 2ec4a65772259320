// The simulator's elliptic functions against published tables, a registry library, and the exact pendulum.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import stdlibEllipk from '@stdlib/math-base-special-ellipk';
import { AS_TABLE_17_1_K, PERIOD_RATIO_TABLE } from '../reference/elliptic-tables.ts';
import { ExactPendulum, agm, ellipF, ellipK, jacobi } from '../reference/elliptic.ts';
import { bobEvents } from '../../sim/swing.ts';

describe('complete elliptic integral K(m)', () => {
  const table = AS_TABLE_17_1_K;
  it.each(table)('K(%s) matches A&S Table 17.1', (m, k) => {
    expect(Math.abs(ellipK(m) - k)).toBeLessThan(3e-15);
  });

  it('K(1/2) = Γ(1/4)²/(4√π) (lemniscatic case, from memory; value recomputed: docs/references.md#ref-elliptic-k)', () => {
    expect(Math.abs(ellipK(0.5) - 1.8540746773013719)).toBeLessThan(3e-15);
  });

  it('agrees with @stdlib/math-base-special-ellipk over 0 ≤ m ≤ 0.999', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 0.999, noNaN: true }), (m) => {
        expect(Math.abs(ellipK(m) - stdlibEllipk(m)) / stdlibEllipk(m)).toBeLessThan(1e-14);
      }),
      { numRuns: 500 },
    );
  });

  it('AGM of (1, √2)/… : the lemniscate constant relation agm(1, 1/√2) = π/(2K(1/2))', () => {
    expect(agm(1, Math.SQRT1_2)).toBeCloseTo(Math.PI / (2 * 1.8540746773013719), 15);
  });
});

describe('incomplete F and Jacobi functions (DLMF §19.25, §22.20)', () => {
  it('am is the inverse of F: am(F(φ|m)|m) = φ, and sn² + cn² = 1 (DLMF 22.6.1)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1.5707, max: 1.5707, noNaN: true }), fc.double({ min: 0, max: 0.99, noNaN: true }), (phi, m) => {
        const u = ellipF(phi, m);
        const j = jacobi(u, m);
        expect(Math.abs(j.am - phi)).toBeLessThan(1e-14);
        expect(Math.abs(j.sn * j.sn + j.cn * j.cn - 1)).toBeLessThan(4e-15);
      }),
      { numRuns: 300 },
    );
  });

  it('quarter and half-quarter periods: sn(K) = 1, dn(K) = k′; sn(K/2) = (1 + k′)^-1/2, dn(K/2) = √k′ (DLMF Table 22.5.2, from memory)', () => {
    for (const m of [0.01, 0.25, 0.5, 0.9, 0.99]) {
      const K = ellipK(m);
      const kp = Math.sqrt(1 - m);
      const q = jacobi(K, m);
      expect(Math.abs(q.sn - 1)).toBeLessThan(1e-15);
      expect(Math.abs(q.dn - kp)).toBeLessThan(1e-15);
      const h = jacobi(K / 2, m);
      expect(Math.abs(h.sn - 1 / Math.sqrt(1 + kp))).toBeLessThan(1e-15);
      expect(Math.abs(h.cn - Math.sqrt(kp / (1 + kp)))).toBeLessThan(1e-15);
      expect(Math.abs(h.dn - Math.sqrt(kp))).toBeLessThan(1e-15);
    }
  });

  it('F(π/2 | m) = K(m)', () => {
    for (const m of [0, 0.1, 0.5, 0.9]) expect(Math.abs(ellipF(Math.PI / 2, m) - ellipK(m))).toBeLessThan(4e-15);
  });
});

describe('exact pendulum', () => {
  const ratios = PERIOD_RATIO_TABLE;
  it.each(ratios)('T/T0 at %s° matches the reference table', (deg, r) => {
    const p = new ExactPendulum((deg * Math.PI) / 180, 1);
    expect(Math.abs(p.period / (2 * Math.PI) - r)).toBeLessThan(2e-14 * r);
  });

  it('the exact crossing times do put θ at the crossing angle', () => {
    const p = new ExactPendulum(Math.PI / 3, 3.13);
    for (const phi of [-0.9, -0.01, 0, 0.3, 1.0]) {
      for (const t of p.crossings(phi, 10)) expect(Math.abs(p.angle(t) - phi)).toBeLessThan(1e-13);
    }
  });
});

describe('integrated swing vs the exact elliptic solution', () => {
  it('no damping, 60°: every beam edge over 1000 periods is within 10 ns of the exact time', () => {
    const g = 9.80665;
    const L = 1;
    const w = Math.sqrt(g / L);
    const th0 = Math.PI / 3;
    const exact = new ExactPendulum(th0, w);
    // An off-centre beam, so edges on both sides of the lowest point are exercised.
    const zone = [Math.asin((0.0005 - 0.0127) / L), Math.asin((0.0005 + 0.0127) / L)] as const;
    const tEnd = 1000 * exact.period;
    const sim: number[] = [];
    const t0 = performance.now();
    for (const e of bobEvents({ ode: { w2: w * w, b1: 0, b2: 0, b0: 0 }, omega0: w, theta0: th0, zone }, tEnd))
      if (e.kind === 'enter' || e.kind === 'exit') sim.push(e.t);
    const ms = performance.now() - t0;
    const want = [...exact.crossings(zone[0], tEnd), ...exact.crossings(zone[1], tEnd)].sort((a, b) => a - b);
    expect(sim.length).toBe(want.length);
    expect(sim.length).toBe(4000);
    let worst = 0;
    for (let i = 0; i < want.length; i++) worst = Math.max(worst, Math.abs(sim[i]! - want[i]!));
    console.log(`sim elliptic check: 4000 edges over 1000 periods at 60°, worst |Δt| = ${(worst * 1e9).toFixed(3)} ns, integration ${ms.toFixed(0)} ms`);
    expect(worst).toBeLessThan(10e-9);
  });

  it('turning points keep the release amplitude (energy) with no damping', () => {
    const w = 3;
    let worst = 0;
    for (const e of bobEvents({ ode: { w2: 9, b1: 0, b2: 0, b0: 0 }, omega0: w, theta0: 1, zone: [-0.01, 0.01] }, 500))
      if (e.kind === 'turn') worst = Math.max(worst, Math.abs(Math.abs(e.theta) - 1));
    expect(worst).toBeLessThan(1e-12);
  });
});
