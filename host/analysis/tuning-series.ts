// Tuning a reversible pendulum: T1 and T2 fitted against the movable mass's position, where they cross, and g there.
// At T1 = T2 = T Bessel's formula becomes 4π²/g = T²/l: the centre-of-mass distances drop out entirely
// (docs/references.md#ref-reversible-pendulum).
import { invertSmall } from './least-squares.ts';
import type { BudgetLine } from './result.ts';
import type { TuningFailure } from './combine-failure.ts';
import { combineBudget } from './uncertainty-budget.ts';

/** One run of the series: the mass position (any fixed mark on the bar), the period and its independent u (statistics and the run's own clock calibration). */
export interface SeriesPoint {
  readonly x_m: number;
  readonly T_s: number;
  readonly u_s: number;
}

export interface TuningInput {
  readonly pivot1: readonly SeriesPoint[];
  readonly pivot2: readonly SeriesPoint[];
  readonly l_m: number;
  readonly l_u_m: number;
  /** Relative u of a device clock common to every run (0: each run's calibration is in its point's u). */
  readonly clock_u_rel: number;
  /** Relative u of the periods from the amplitude reduction (same flag and gate for every run: common). */
  readonly amp_u_rel: number;
  /**
   * Relative u of each pivot's periods common to that pivot's runs only (its own flag radius: the flag does not move
   * with the mass), [pivot 1, pivot 2]; it shifts that pivot's fit as a whole, and so the crossing (absent: 0).
   */
  readonly pivot_u_rel?: readonly [number, number];
  /** Where the mass was last (the next move is given from here). */
  readonly last_x_m: number;
}

/** A weighted polynomial T(x) = Σ c_j (x − x̄)^j with its parameter covariance. */
export interface PolyFit {
  readonly centre_m: number;
  readonly coef: number[];
  readonly cov: number[][];
  readonly chi2: number;
  readonly dof: number;
}

export type TuningResult =
  | {
      readonly ok: true;
      readonly crossing_m: number;
      readonly crossing_u_m: number;
      readonly T_s: number;
      readonly T_u_s: number;
      readonly g_m_s2: number;
      readonly g_u_m_s2: number;
      readonly budget: BudgetLine[];
      readonly fit1: PolyFit;
      readonly fit2: PolyFit;
      /** Signed move from last_x_m to the crossing, m (in the coordinate of mass_position_m). */
      readonly next_move_m: number;
    }
  | { readonly ok: false; readonly reason: TuningFailure };

export const polyAt = (f: Pick<PolyFit, 'centre_m' | 'coef'>, x: number): number => f.coef.reduceRight((s, c) => s * (x - f.centre_m) + c, 0);

/**
 * Weighted polynomial fit of T against x: a straight line for two or three runs, a parabola from four on (the
 * period is a smooth function of the mass position; over a tuning range the parabola's residual curvature error is
 * small against a period's noise). The covariance is the inputs' own: with one or two degrees of freedom χ²/dof
 * is far too noisy to rescale it by; χ² is returned so that a bad fit can be reported.
 */
export function fitPoly(pts: readonly SeriesPoint[]): PolyFit | null {
  const deg = pts.length >= 4 ? 2 : 1;
  if (pts.length < 2 || pts.some((p) => !(p.u_s > 0) || !Number.isFinite(p.T_s) || !Number.isFinite(p.x_m))) return null;
  const centre = pts.reduce((s, p) => s + p.x_m, 0) / pts.length;
  const p = deg + 1;
  const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const aty = new Array<number>(p).fill(0);
  for (const q of pts) {
    const w = 1 / (q.u_s * q.u_s);
    const row = Array.from({ length: p }, (_, j) => (q.x_m - centre) ** j);
    for (let j = 0; j < p; j++) {
      aty[j]! += w * row[j]! * q.T_s;
      for (let k = 0; k < p; k++) ata[j]![k]! += w * row[j]! * row[k]!;
    }
  }
  const inv = invertSmall(ata);
  if (!inv) return null;
  const coef = inv.map((r) => r.reduce((s, v, k) => s + v * aty[k]!, 0));
  const f = { centre_m: centre, coef };
  const chi2 = pts.reduce((s, q) => s + ((q.T_s - polyAt(f, q.x_m)) / q.u_s) ** 2, 0);
  return { centre_m: centre, coef, cov: inv, chi2, dof: pts.length - p };
}

/** A shift common to every point moves only the constant of a centred fit, by exactly that shift: its variance adds there. */
function withCommonShift(f: PolyFit | null, pts: readonly SeriesPoint[], uRel: number): PolyFit | null {
  if (!f || uRel === 0) return f;
  const u = uRel * (pts.reduce((s, p) => s + p.T_s, 0) / pts.length);
  return { ...f, cov: f.cov.map((row, i) => row.map((v, j) => (i === 0 && j === 0 ? v + u * u : v))) };
}

/** Root of f1 − f2 nearest the data: Newton from the crossing of the tangents at the fits' centre. */
function crossing(f1: Pick<PolyFit, 'centre_m' | 'coef'>, f2: Pick<PolyFit, 'centre_m' | 'coef'>, start: number): number {
  let x = start;
  for (let i = 0; i < 50; i++) {
    const d = polyAt(f1, x) - polyAt(f2, x);
    const h = 1e-6;
    const slope = (polyAt(f1, x + h) - polyAt(f2, x + h) - d) / h;
    if (!(Math.abs(slope) > 0)) return NaN;
    const step = d / slope;
    x -= step;
    if (Math.abs(step) < 1e-13) break;
  }
  return Number.isFinite(polyAt(f1, x) - polyAt(f2, x)) ? x : NaN;
}

/** The crossing of T1(x) and T2(x), g there and the next move, with first-order propagation of both fits. */
export function tuningCrossing(x: TuningInput): TuningResult {
  const f1 = withCommonShift(fitPoly(x.pivot1), x.pivot1, x.pivot_u_rel?.[0] ?? 0);
  const f2 = withCommonShift(fitPoly(x.pivot2), x.pivot2, x.pivot_u_rel?.[1] ?? 0);
  if (!f1 || !f2) return { ok: false, reason: { kind: 'tuning-too-few-points' } };
  const xs = [...x.pivot1, ...x.pivot2].map((p) => p.x_m);
  const span = Math.max(...xs) - Math.min(...xs);
  const start = xs.reduce((s, v) => s + v, 0) / xs.length;
  // Parameters of both fits in one vector; x* and T* = (T1(x*) + T2(x*))/2 as functions of it.
  const n1 = f1.coef.length;
  const at = (v: readonly number[]): { xc: number; T: number } => {
    const a = { centre_m: f1.centre_m, coef: v.slice(0, n1) };
    const b = { centre_m: f2.centre_m, coef: v.slice(n1) };
    const xc = crossing(a, b, start);
    return { xc, T: 0.5 * (polyAt(a, xc) + polyAt(b, xc)) };
  };
  const v0 = [...f1.coef, ...f2.coef];
  const c0 = at(v0);
  if (!Number.isFinite(c0.xc) || Math.abs(c0.xc - start) > 10 * Math.max(span, 1e-3))
    return { ok: false, reason: { kind: 'tuning-no-crossing' } };
  const cov = (i: number, j: number): number =>
    i < n1 && j < n1 ? f1.cov[i]![j]! : i >= n1 && j >= n1 ? f2.cov[i - n1]![j - n1]! : 0;
  const jx: number[] = [];
  const jt: number[] = [];
  for (let i = 0; i < v0.length; i++) {
    const h = Math.sqrt(cov(i, i)) * 1e-3 || 1e-12;
    const v = [...v0];
    v[i]! += h;
    const c = at(v);
    jx.push((c.xc - c0.xc) / h);
    jt.push((c.T - c0.T) / h);
  }
  let vx = 0;
  let vt = 0;
  for (let i = 0; i < v0.length; i++)
    for (let j = 0; j < v0.length; j++) (vx += jx[i]! * cov(i, j) * jx[j]!), (vt += jt[i]! * cov(i, j) * jt[j]!);
  const g = (4 * Math.PI * Math.PI * x.l_m) / (c0.T * c0.T);
  const uT = Math.sqrt(vt);
  const budget: BudgetLine[] = [
    { id: 'knife-edge-distance', name: 'knife-edge distance l', u_rel_g: x.l_u_m / x.l_m, note: { kind: 'length', symbol: 'l', m: x.l_m, u_m: x.l_u_m } },
    { id: 'crossing-period', name: 'period at the crossing (fits of T1 and T2: statistics, clock calibration of each run, flag radius of each pivot)', u_rel_g: (2 * uT) / c0.T, note: { kind: 'period', symbol: 'T', s: c0.T, u_s: uT } },
    { id: 'amplitude-reduction', name: 'amplitude reduction (every run, same flag and gate)', u_rel_g: 2 * x.amp_u_rel },
    ...(x.clock_u_rel > 0 ? [{ id: 'clock', name: 'device clock (common to every run)', u_rel_g: 2 * x.clock_u_rel, note: { kind: 'common-clock', u_rel: x.clock_u_rel } } satisfies BudgetLine] : []),
  ];
  return {
    ok: true,
    crossing_m: c0.xc,
    crossing_u_m: Math.sqrt(vx),
    T_s: c0.T,
    T_u_s: uT,
    g_m_s2: g,
    g_u_m_s2: g * combineBudget(budget),
    budget,
    fit1: f1,
    fit2: f2,
    next_move_m: c0.xc - x.last_x_m,
  };
}
