import { describe, expect, it } from 'vitest';
import { fitPoly, polyAt, tuningCrossing, type SeriesPoint } from '../../host/analysis/tuning-series.ts';
import { TestRng } from './seeded-rng.ts';
import { combineFailureText } from '../../host/output/combine-words.ts';

// A Kater-style bar written out here (independently of the simulator): a uniform 1.2 m, 1 kg bar with knife edges
// 0.1 m and 1.1 m from its top end (l = 1 m), a fixed 1.5 kg mass at 1.16 m and a movable 0.5 kg mass at x, both
// as point masses. T = 2π√((I_cm + M h²)/(M g h)) about each edge (docs/references.md#ref-reversible-pendulum).
const G = 9.81;
function periods(x: number): { T1: number; T2: number; h1: number; h2: number } {
  const M = 1 + 0.5 + 1.5;
  const y = (1 * 0.6 + 0.5 * x + 1.5 * 1.16) / M;
  const I = (1 * 1.2 ** 2) / 12 + 1 * (0.6 - y) ** 2 + 0.5 * (x - y) ** 2 + 1.5 * (1.16 - y) ** 2;
  const t = (h: number): number => 2 * Math.PI * Math.sqrt((I + M * h * h) / (M * G * h));
  return { T1: t(y - 0.1), T2: t(1.1 - y), h1: y - 0.1, h2: 1.1 - y };
}
/** The true crossing by bisection on T1 − T2. */
function trueCrossing(): number {
  let a = 0;
  let b = 0.08;
  for (let i = 0; i < 200; i++) {
    const m = (a + b) / 2;
    const d = periods(m).T1 - periods(m).T2;
    if (Math.sign(d) === Math.sign(periods(a).T1 - periods(a).T2)) a = m;
    else b = m;
  }
  return (a + b) / 2;
}

const positions = [0.02, 0.03, 0.04, 0.05];
function series(rng: TestRng | null, u: number): { p1: SeriesPoint[]; p2: SeriesPoint[] } {
  const noise = (): number => (rng ? u * rng.normal() : 0);
  return {
    p1: positions.map((x) => ({ x_m: x, T_s: periods(x).T1 + noise(), u_s: u })),
    p2: positions.map((x) => ({ x_m: x + 0.002, T_s: periods(x + 0.002).T2 + noise(), u_s: u })),
  };
}

describe('tuning series of a reversible pendulum', () => {
  const xc = trueCrossing();
  const Tc = periods(xc).T1;

  it('the bar really is reversible at the crossing: h1 ≠ h2, and 4π²l/T² there is g (derived)', () => {
    const { h1, h2 } = periods(xc);
    expect(Math.abs(h1 - h2)).toBeGreaterThan(0.3);
    expect((4 * Math.PI ** 2 * 1) / (Tc * Tc)).toBeCloseTo(G, 9);
  });

  it('noise-free runs give the crossing, and g there, to far below any real uncertainty', () => {
    const { p1, p2 } = series(null, 3e-7);
    const r = tuningCrossing({ pivot1: p1, pivot2: p2, l_m: 1, l_u_m: 0, clock_u_rel: 0, amp_u_rel: 0, last_x_m: 0.06 });
    if (!r.ok) throw new Error(combineFailureText(r.reason));
    expect(Math.abs(r.crossing_m - xc)).toBeLessThan(1e-6);
    expect(Math.abs(r.g_m_s2 / G - 1)).toBeLessThan(3e-7);
    // The mass was last at 0.06 m and the crossing is near 0.035 m: move it toward smaller positions.
    expect(r.next_move_m).toBeCloseTo(xc - 0.06, 6);
  });

  it('a straight line for three runs, a parabola from four; over 30 mm the parabola misses the exact T1(x) by < 0.1 µs', () => {
    const pts = positions.map((x) => ({ x_m: x, T_s: periods(x).T1, u_s: 1e-7 }));
    expect(fitPoly(pts.slice(0, 3))!.coef.length).toBe(2);
    const f = fitPoly(pts)!;
    expect(f.coef.length).toBe(3);
    for (const p of pts) expect(Math.abs(polyAt(f, p.x_m) - p.T_s)).toBeLessThan(1e-7);
  });

  it('k = 2 coverage of the crossing and of g over seeds: 93–97 % (pure-model Monte Carlo, 0.3 µs per period)', () => {
    const rng = new TestRng(4);
    const trials = 2000;
    let inX = 0;
    let inG = 0;
    for (let s = 0; s < trials; s++) {
      const { p1, p2 } = series(rng, 3e-7);
      const l = 1 + 2e-5 * rng.normal();
      const r = tuningCrossing({ pivot1: p1, pivot2: p2, l_m: l, l_u_m: 2e-5, clock_u_rel: 0, amp_u_rel: 0, last_x_m: 0.06 });
      if (!r.ok) throw new Error(combineFailureText(r.reason));
      if (Math.abs(r.crossing_m - xc) <= 2 * r.crossing_u_m) inX++;
      if (Math.abs(r.g_m_s2 - G) <= 2 * r.g_u_m_s2) inG++;
    }
    expect(inX / trials).toBeGreaterThan(0.93);
    expect(inX / trials).toBeLessThan(0.97);
    expect(inG / trials).toBeGreaterThan(0.93);
    expect(inG / trials).toBeLessThan(0.97);
  });

  it('a shift common to one pivot\'s runs (its own flag radius) is in the crossing\'s u: 93–97 % with it, far less without', () => {
    // Each pivot's periods shifted as a whole by N(0, 2e-7) relative (about 0.4 µs, each pivot its own draw): the
    // crossing moves by that over the slope of T1 − T2 whatever the number of runs (pure-model Monte Carlo).
    const rng = new TestRng(8);
    const trials = 2000;
    const uRel = 2e-7;
    let inWith = 0;
    let inWithout = 0;
    for (let s = 0; s < trials; s++) {
      const { p1, p2 } = series(rng, 3e-7);
      const [d1, d2] = [uRel * rng.normal(), uRel * rng.normal()];
      const q1 = p1.map((p) => ({ ...p, T_s: p.T_s * (1 + d1) }));
      const q2 = p2.map((p) => ({ ...p, T_s: p.T_s * (1 + d2) }));
      const base = { pivot1: q1, pivot2: q2, l_m: 1, l_u_m: 0, clock_u_rel: 0, amp_u_rel: 0, last_x_m: 0.06 };
      const a = tuningCrossing({ ...base, pivot_u_rel: [uRel, uRel] });
      const b = tuningCrossing(base);
      if (!a.ok || !b.ok) throw new Error('no crossing');
      if (Math.abs(a.crossing_m - xc) <= 2 * a.crossing_u_m) inWith++;
      if (Math.abs(b.crossing_m - xc) <= 2 * b.crossing_u_m) inWithout++;
    }
    expect(inWith / trials).toBeGreaterThan(0.93);
    expect(inWith / trials).toBeLessThan(0.97);
    expect(inWithout / trials).toBeLessThan(0.85);
  });

  it('says so when T1 and T2 do not cross near the runs', () => {
    const p1 = [0.0, 0.01].map((x) => ({ x_m: x, T_s: 2 + x, u_s: 1e-6 }));
    const p2 = [0.0, 0.01].map((x) => ({ x_m: x, T_s: 2.1 + x, u_s: 1e-6 }));
    const r = tuningCrossing({ pivot1: p1, pivot2: p2, l_m: 1, l_u_m: 0, clock_u_rel: 0, amp_u_rel: 0, last_x_m: 0 });
    expect(r).toEqual({ ok: false, reason: { kind: 'tuning-no-crossing' } });
    expect(combineFailureText({ kind: 'tuning-no-crossing' })).toMatch(/do not cross near the measured mass positions .*: move the mass further$/);
  });
});
