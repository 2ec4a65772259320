// g from one bob timed at two or more string lengths, read off one scale whose zero is unknown (Bessel's
// seconds-pendulum method, docs/references.md#ref-two-length): the corrected periods obey T² = (4π²/g)(x + c) with
// x the reading and c the common offset, so a weighted line through (x, T²) gives g from its slope and c from its
// intercept; only the differences of the readings matter for g.
import { invertSmall } from './least-squares.ts';
import type { BudgetLine } from './result.ts';
import { combineBudget } from './uncertainty-budget.ts';

export interface LengthRun {
  /** The scale's reading (the rig's length_m), m. */
  readonly reading_m: number;
  /** Zero-amplitude period with damping removed, s. */
  readonly T0_s: number;
  /** Its standard uncertainty without the clock (statistics, amplitude reduction), s. */
  readonly u_s: number;
  /** This run's own clock calibration, s (independent between runs; a common clock is clock_u_rel). */
  readonly u_clock_s?: number;
}

export interface TwoLengthInput {
  readonly runs: readonly LengthRun[];
  /** Standard uncertainty of a difference of two readings; each reading counts as independent with this/√2. */
  readonly length_step_u_m: number;
  readonly clock_u_rel: number;
  /** Length of the equivalent simple pendulum at a true pivot-to-centre distance L (finite bob, string mass). */
  readonly effectiveLength: (L: number) => number;
  /** Relative u of each of those corrections, taken together for every length (0.1: common practice, no source). */
  readonly correction_u_frac: number;
  /** Air (buoyancy and added mass) as a relative period change applied, and its relative u (the same bob throughout). */
  readonly air_rel: number;
  readonly air_u_rel: number;
}

export interface TwoLengthResult {
  readonly g_m_s2: number;
  readonly g_u_m_s2: number;
  /** The line's slope: T² per metre of reading (4π²/g before the air correction), s²/m. */
  readonly slope_s2_per_m: number;
  /** True pivot-to-centre distance minus the reading, m. */
  readonly offset_m: number;
  readonly offset_u_m: number;
  readonly budget: BudgetLine[];
  /** Per run: the corrected period squared used in the fit, s². */
  readonly T2_corrected_s2: number[];
  /** Each run's share of the 'length-t0' line (relative u of g; their root sum of squares is that line). */
  readonly t0_shares: { readonly reading_m: number; readonly u_rel_g: number }[];
  /** χ² of the line (0 for two lengths) and its degrees of freedom. */
  readonly chi2: number;
  readonly dof: number;
}

interface LineFit {
  a: number;
  b: number;
  /** Rows of (XᵀWX)⁻¹XᵀW: a and b as weighted sums of the y values. */
  m: number[][];
  y: number[];
  sigmaY: number[];
  chi2: number;
}

/** One fixed point of the corrections (they depend on the true length x + c) and the weighted line through (x, T²). */
function fitOnce(x: TwoLengthInput, c: number, corrScale: number, aGuess: number): LineFit | null {
  const ux = x.length_step_u_m / Math.SQRT2;
  const y: number[] = [];
  const uy: number[] = [];
  for (const r of x.runs) {
    const L = r.reading_m + c;
    const Leff = L + corrScale * (x.effectiveLength(L) - L);
    const f = L / Leff;
    y.push(r.T0_s * r.T0_s * f);
    uy.push(2 * r.T0_s * Math.hypot(r.u_s, r.u_clock_s ?? 0) * f);
  }
  // Effective variance: the reading's error moves the point along the line's slope.
  const s2 = uy.map((u) => u * u + aGuess * aGuess * ux * ux);
  const ata = [
    [0, 0],
    [0, 0],
  ];
  x.runs.forEach((r, i) => {
    const w = 1 / s2[i]!;
    ata[0]![0]! += w * r.reading_m * r.reading_m;
    ata[0]![1]! += w * r.reading_m;
    ata[1]![1]! += w;
  });
  ata[1]![0] = ata[0]![1]!;
  const inv = invertSmall(ata);
  if (!inv) return null;
  const m = [0, 1].map((j) => x.runs.map((r, i) => (inv[j]![0]! * r.reading_m + inv[j]![1]!) / s2[i]!));
  const a = m[0]!.reduce((s, v, i) => s + v * y[i]!, 0);
  const b = m[1]!.reduce((s, v, i) => s + v * y[i]!, 0);
  const chi2 = x.runs.reduce((s, r, i) => s + (y[i]! - a * r.reading_m - b) ** 2 / s2[i]!, 0);
  return { a, b, m, y, sigmaY: uy, chi2 };
}

/** Iterates the corrections to the fitted offset; the air factor multiplies every period alike, so only g feels it. */
function solve(x: TwoLengthInput, corrScale: number): LineFit | null {
  let c = 0;
  let a = (4 * Math.PI * Math.PI) / 9.8;
  let fit: LineFit | null = null;
  for (let k = 0; k < 8; k++) {
    fit = fitOnce(x, c, corrScale, a);
    if (!fit || !(fit.a > 0)) return null;
    const moved = Math.abs(fit.b / fit.a - c);
    c = fit.b / fit.a;
    a = fit.a;
    if (moved < 1e-10) break;
  }
  return fit;
}

/** The two-length (or more) fit with an uncertainty budget for g and the offset's standard uncertainty. */
export function twoLengthFit(x: TwoLengthInput): TwoLengthResult | null {
  const readings = x.runs.map((r) => r.reading_m);
  if (x.runs.length < 2 || Math.max(...readings) - Math.min(...readings) <= 0) return null;
  const fit = solve(x, 1);
  const shifted = solve(x, 1 + x.correction_u_frac);
  if (!fit || !shifted) return null;
  const { a, b } = fit;
  const ux = x.length_step_u_m / Math.SQRT2;
  const n = x.runs.length;
  const dof = n - 2;
  const birge = dof > 0 ? Math.sqrt(Math.max(1, fit.chi2 / dof)) : 1;
  // a and b are linear in the y values; a reading's error δx enters as −a·δx.
  const part = (u: (i: number) => number): { ua: number; uc: number } => {
    let va = 0;
    let vc = 0;
    for (let i = 0; i < n; i++) {
      const ma = fit.m[0]![i]!;
      const mc = (fit.m[1]![i]! - (b / a) * ma) / a;
      va += (ma * u(i)) ** 2;
      vc += (mc * u(i)) ** 2;
    }
    return { ua: (Math.sqrt(va) * birge) / a, uc: Math.sqrt(vc) * birge };
  };
  const px = part(() => a * ux);
  // sigmaY = 2T·u·f with u = hypot(u_s, u_clock_s): each part's share scales it.
  const share = (i: number, which: 'u_s' | 'u_clock_s'): number => {
    const r = x.runs[i]!;
    const all = Math.hypot(r.u_s, r.u_clock_s ?? 0);
    return all > 0 ? (fit.sigmaY[i]! * (r[which] ?? 0)) / all : 0;
  };
  const py = part((i) => share(i, 'u_s'));
  const pk = part((i) => share(i, 'u_clock_s'));
  const t0_shares = x.runs.map((r, i) => ({ reading_m: r.reading_m, u_rel_g: part((j) => (j === i ? share(i, 'u_s') : 0)).ua }));
  const corrA = Math.abs(shifted.a / a - 1);
  const corrC = Math.abs(shifted.b / shifted.a - b / a);
  const g = (4 * Math.PI * Math.PI * (1 + x.air_rel) ** 2) / a;
  const budget: BudgetLine[] = [
    { id: 'length-differences', name: 'length differences (one scale)', u_rel_g: px.ua, note: { kind: 'scale-reading', u_m: ux } },
    { id: 'length-t0', name: 'T0 of each length (statistics, amplitude reduction)', u_rel_g: py.ua, note: { kind: 'lengths', count: n } },
    { id: 'length-corrections', name: 'corrections per length (finite bob, string mass)', u_rel_g: corrA, note: { kind: 'correction-fraction', fraction: x.correction_u_frac } },
    { id: 'air', name: 'air buoyancy and added mass (same bob throughout)', u_rel_g: 2 * x.air_u_rel },
    {
      id: 'clock',
      name: 'device clock (each run calibrated on its own, and any common part)',
      u_rel_g: Math.hypot(2 * x.clock_u_rel, pk.ua),
      ...(x.clock_u_rel > 0 ? { note: { kind: 'common-clock', u_rel: x.clock_u_rel } } : {}),
    },
  ];
  return {
    g_m_s2: g,
    g_u_m_s2: g * combineBudget(budget),
    slope_s2_per_m: a,
    offset_m: b / a,
    offset_u_m: Math.hypot(px.uc, py.uc, pk.uc, corrC),
    budget,
    T2_corrected_s2: fit.y,
    t0_shares,
    chi2: fit.chi2,
    dof,
  };
}
