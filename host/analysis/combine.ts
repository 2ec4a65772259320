// `combine`'s pure core: several journals' analyses (each exactly as `analyze` made it) and their rigs → g by the
// two-length method or by Bessel's formula for the reversible pendulum (one pair, or a tuning series), or one line
// saying why not (as data: host/analysis/combine-failure.ts). No I/O: the two-length method re-reduces a journal through the injected `reduce`.
import { isSimpleRig, type AnyRig, type ReversibleRig, type Rig } from '../../protocol/rig.ts';
import { besselG, type PivotPeriod } from './bessel.ts';
import { BOB_KEYS, type CombineFailure } from './combine-failure.ts';
import { pendulumModel } from './pendulum-corrections.ts';
import type { AnalysisResult, BudgetLine } from './result.ts';
import { tuningCrossing, type PolyFit, type SeriesPoint } from './tuning-series.ts';
import { twoLengthFit, type TwoLengthResult } from './two-length-fit.ts';

/** One journal as `analyze` reduced it, with the rig it was reduced with and the name it was given as. */
export interface CombineRun {
  readonly file: string;
  readonly rig: AnyRig;
  readonly result: AnalysisResult;
}

/** Reduces run `index` again with its rig's length_m replaced (the two-length fixed point). */
export type Reduce = (index: number, length_m: number) => AnalysisResult;

export interface TwoLengthJournal {
  readonly file: string;
  readonly T0_s: number;
  readonly T0_u_s: number;
  readonly length_m: number;
}

export interface TwoLengthCombined {
  readonly method: 'two-length';
  readonly g_m_s2: number;
  readonly g_u_m_s2: number;
  readonly length_offset_m: number;
  readonly length_offset_u_m: number;
  readonly journals: TwoLengthJournal[];
  readonly budget: BudgetLine[];
  /** Each journal's share of the T0 line of the budget. */
  readonly t0_shares: TwoLengthResult['t0_shares'];
  /** T0² corrected to the equivalent simple pendulum, per journal (the fit's points), s², and the line's slope, s²/m. */
  readonly T0_squared_s2: number[];
  readonly slope_s2_per_m: number;
  /** How many reductions the fixed point took (1: the rig's length_m already gave the final amplitudes). */
  readonly iterations: number;
  readonly chi2: number;
  readonly dof: number;
  readonly expected_g_m_s2: number | null;
}

export interface ReversibleJournal {
  readonly file: string;
  readonly pivot: 1 | 2;
  readonly T0_s: number;
  readonly T0_u_s: number;
  readonly mass_position_m?: number;
}

export interface ReversibleCombined {
  readonly method: 'reversible';
  readonly g_m_s2: number;
  readonly g_u_m_s2: number;
  readonly journals: ReversibleJournal[];
  readonly budget: BudgetLine[];
  /** A tuning series: the crossing of T1(x) and T2(x), the fits, and the signed move from the last position to it. */
  readonly crossing_position_m?: number;
  readonly crossing_position_u_m?: number;
  readonly series?: { readonly fit1: PolyFit; readonly fit2: PolyFit; readonly next_move_m: number; readonly last_position_m: number; readonly T_s: number; readonly T_u_s: number };
  /** One pair: T1 − T2 (s) and the two terms of 4π²/g. */
  readonly pair?: { readonly T1_s: number; readonly T2_s: number; readonly sum_term: number; readonly difference_term: number };
  readonly expected_g_m_s2: number | null;
}

export type Combined = TwoLengthCombined | ReversibleCombined;
export type CombineOutcome = { readonly ok: true; readonly result: Combined } | { readonly ok: false; readonly failure: CombineFailure };

const fail = (failure: CombineFailure): CombineOutcome => ({ ok: false, failure });
const rowOf = (r: AnalysisResult, id: string): number => r.budget.find((b) => b.id === id)?.u_rel_g ?? 0;

/**
 * A journal's T0 split as the combinations need it (relative u of g in the budget rows are twice the period's):
 * statistics and damping are its own; the amplitude reduction (flag width, sensor delays) is shared by journals
 * timed with the same flag and gate; the clock rate is estimated afresh from each journal, so its error is the
 * journal's own (on simulated sessions the runs' T0 errors scatter by that ~1e-7, far above their statistics).
 * A reversible pendulum's flag radius is measured from each edge apart: its share of the flag row (the transit
 * reads w/R, protocol/rig.ts swingView) is common to one pivot's journals only, so it is kept apart as u_radius_s.
 */
export function periodParts(r: AnalysisResult, rig?: AnyRig): Required<PivotPeriod> {
  const T = r.T0_s!;
  const flag = rowOf(r, 'flag-width');
  const radiusShare = rig && !isSimpleRig(rig) ? radiusVarianceShare(rig) : 0;
  return {
    T_s: T,
    u_stat_s: (T * Math.hypot(rowOf(r, 'statistics'), rowOf(r, 'damping'))) / 2,
    u_amp_s: (T * Math.hypot(flag * Math.sqrt(1 - radiusShare), rowOf(r, 'delay-difference'))) / 2,
    u_clock_s: T * (r.clock_u_ppm ?? 0) * 1e-6,
    u_radius_s: (T * flag * Math.sqrt(radiusShare)) / 2,
  };
}

/** The flag radius's share of the variance of w/R (the flag row is linear in it for errors this small). */
function radiusVarianceShare(rig: ReversibleRig): number {
  const byRadius = (rig.flag_width_m * (rig.flag_radius_u_m ?? 0)) / rig.flag_radius_m;
  const total = rig.flag_width_u_m ** 2 + byRadius ** 2;
  return total > 0 ? byRadius ** 2 / total : 0;
}

/** The method from the rigs, or why these journals cannot be combined. */
export function combineRuns(runs: readonly CombineRun[], reduce: Reduce): CombineOutcome {
  if (runs.length < 2) return fail({ kind: 'too-few-journals', count: runs.length });
  const short = runs.find((r) => r.result.T0_s === null || r.result.T0_u_s === null);
  if (short) return fail({ kind: 'too-few-passes', file: short.file, passes: short.result.passes });
  const simple = runs.filter((r) => isSimpleRig(r.rig));
  if (simple.length > 0 && simple.length < runs.length) {
    const rev = runs.find((r) => !isSimpleRig(r.rig))!;
    return fail({ kind: 'mixed-pendulums', ordinary: simple[0]!.file, reversible: rev.file });
  }
  // Normal gravity at the first rig's latitude and elevation, as analyze gives it.
  const expected = runs[0]!.result.expected_g_m_s2;
  return simple.length ? combineTwoLength(runs as readonly (CombineRun & { rig: Rig })[], reduce, expected) : combineReversible(runs as readonly (CombineRun & { rig: ReversibleRig })[], expected);
}

function twoLengthChecks(runs: readonly (CombineRun & { rig: Rig })[]): CombineFailure | null {
  const first = runs[0]!;
  for (const r of runs.slice(1))
    for (const k of BOB_KEYS)
      if (r.rig[k] !== first.rig[k]) return { kind: 'different-bobs', first: first.file, other: r.file, key: k, values: [first.rig[k], r.rig[k]] };
  if (new Set(runs.map((r) => r.rig.length_m)).size < 2) return { kind: 'one-length', length_m: first.rig.length_m };
  const noStep = runs.find((r) => r.rig.length_step_u_m === undefined);
  if (noStep) return { kind: 'no-length-step', file: noStep.file };
  return null;
}

/** The weighted fit of T0² against the readings, with each journal reduced again at reading + offset until the offset settles. */
function combineTwoLength(runs: readonly (CombineRun & { rig: Rig })[], reduce: Reduce, expected: number | null): CombineOutcome {
  const why = twoLengthChecks(runs);
  if (why) return fail(why);
  const step = Math.max(...runs.map((r) => r.rig.length_step_u_m!));
  let results = runs.map((r) => r.result);
  let fit: TwoLengthResult | null = null;
  let iterations = 0;
  // The reading alone moves a 0.6 m run's T0 by up to 8e-6 at 5° (issue #17); a few µm of offset change is far below that.
  for (let offset = 0; iterations < 5; iterations++) {
    fit = fitLengths(runs, results, step);
    if (!fit) return fail({ kind: 'two-length-fit-failed' });
    if (iterations > 0 && Math.abs(fit.offset_m - offset) < 1e-6) break;
    offset = fit.offset_m;
    results = runs.map((r, i) => reduce(i, r.rig.length_m + offset));
    const lost = results.findIndex((r) => r.T0_s === null);
    if (lost >= 0) return fail({ kind: 'no-period-at-length', file: runs[lost]!.file, length_m: runs[lost]!.rig.length_m + offset });
  }
  fit = fit!;
  const journals = runs.map((r, i) => ({ file: r.file, T0_s: results[i]!.T0_s!, T0_u_s: results[i]!.T0_u_s!, length_m: r.rig.length_m }));
  return {
    ok: true,
    result: {
      method: 'two-length',
      g_m_s2: fit.g_m_s2,
      g_u_m_s2: fit.g_u_m_s2,
      length_offset_m: fit.offset_m,
      length_offset_u_m: fit.offset_u_m,
      journals,
      budget: fit.budget,
      t0_shares: fit.t0_shares,
      T0_squared_s2: fit.T2_corrected_s2,
      slope_s2_per_m: fit.slope_s2_per_m,
      iterations,
      chi2: fit.chi2,
      dof: fit.dof,
      expected_g_m_s2: expected,
    },
  };
}

/** One pass of the fit on the current reductions; the corrections come from the rig at each true length. */
function fitLengths(runs: readonly (CombineRun & { rig: Rig })[], results: readonly AnalysisResult[], step: number): TwoLengthResult | null {
  const rig0 = runs[0]!.rig;
  const parts = results.map((r) => periodParts(r));
  const model = pendulumModel(rig0, (2 * Math.PI) / parts[0]!.T_s, null);
  const air = model.lines.find((l) => l.id === 'air')!;
  return twoLengthFit({
    runs: runs.map((r, i) => ({ reading_m: r.rig.length_m, T0_s: parts[i]!.T_s, u_s: Math.hypot(parts[i]!.u_stat_s, parts[i]!.u_amp_s), u_clock_s: parts[i]!.u_clock_s })),
    length_step_u_m: step,
    clock_u_rel: 0,
    effectiveLength: (L) => pendulumModel({ ...rig0, length_m: L }, (2 * Math.PI) / parts[0]!.T_s, null).L_eff_m,
    correction_u_frac: 0.1,
    air_rel: model.air_rel,
    air_u_rel: air.u_rel ?? Math.abs(air.period_rel) / Math.sqrt(3),
  });
}

/** What must agree between the journals of one bar. */
function reversibleChecks(runs: readonly (CombineRun & { rig: ReversibleRig })[]): CombineFailure | null {
  const first = runs[0]!;
  const other = runs.find((r) => r.rig.edge_distance_m !== first.rig.edge_distance_m || r.rig.flag_width_m !== first.rig.flag_width_m);
  if (other)
    return {
      kind: 'different-bars',
      first: first.file,
      other: other.file,
      edge_distance_m: [first.rig.edge_distance_m, other.rig.edge_distance_m],
      flag_width_m: [first.rig.flag_width_m, other.rig.flag_width_m],
    };
  for (const p of [1, 2] as const) if (!runs.some((r) => r.rig.pivot === p)) return { kind: 'one-pivot', missing: p };
  const withX = runs.filter((r) => r.rig.mass_position_m !== undefined).length;
  if (withX > 0 && withX < runs.length) {
    return { kind: 'mass-position-missing', file: runs.find((r) => r.rig.mass_position_m === undefined)!.file };
  }
  return null;
}

/** Air's share of the body's weight, when the rigs give the body's volume and mass (and agree on them). */
function buoyancyRel(runs: readonly (CombineRun & { rig: ReversibleRig })[]): number {
  const r = runs.find((x) => x.rig.body_volume_m3 !== undefined && x.rig.body_mass_kg !== undefined)?.rig;
  return r ? (r.air_density_kg_m3 * r.body_volume_m3!) / r.body_mass_kg! : 0;
}

function combineReversible(runs: readonly (CombineRun & { rig: ReversibleRig })[], expected: number | null): CombineOutcome {
  const why = reversibleChecks(runs);
  if (why) return fail(why);
  const journals = runs.map((r) => ({
    file: r.file,
    pivot: r.rig.pivot,
    T0_s: r.result.T0_s!,
    T0_u_s: r.result.T0_u_s!,
    ...(r.rig.mass_position_m !== undefined ? { mass_position_m: r.rig.mass_position_m } : {}),
  }));
  const rig = runs[0]!.rig;
  const parts = runs.map((r) => periodParts(r.result, r.rig));
  if (rig.mass_position_m !== undefined) return tuningSeries(runs, journals, parts, expected);
  const one = (p: 1 | 2): { period: PivotPeriod; rig: ReversibleRig } | CombineFailure => {
    const idx = runs.map((r, i) => (r.rig.pivot === p ? i : -1)).filter((i) => i >= 0);
    const h = new Set(idx.map((i) => runs[i]!.rig.cm_distance_m));
    if (h.size > 1) return { kind: 'pivot-cm-distances-differ', pivot: p, values: [...h] };
    return { period: meanPeriod(idx.map((i) => parts[i]!)), rig: runs[idx[0]!]!.rig };
  };
  const p1 = one(1);
  const p2 = one(2);
  if ('kind' in p1) return fail(p1);
  if ('kind' in p2) return fail(p2);
  const b = besselG({
    pivot1: p1.period,
    pivot2: p2.period,
    l_m: rig.edge_distance_m,
    l_u_m: Math.max(...runs.map((r) => r.rig.edge_distance_u_m)),
    h1_m: p1.rig.cm_distance_m,
    h2_m: p2.rig.cm_distance_m,
    dh_u_m: p1.rig.cm_distance_u_m + p2.rig.cm_distance_u_m,
    clock_u_rel: 0,
    buoyancy_rel: buoyancyRel(runs),
  });
  if (!b) return fail({ kind: 'bessel-no-solution', h1_m: p1.rig.cm_distance_m, h2_m: p2.rig.cm_distance_m });
  return {
    ok: true,
    result: {
      method: 'reversible',
      g_m_s2: b.g_m_s2,
      g_u_m_s2: b.g_u_m_s2,
      journals,
      budget: b.budget,
      pair: { T1_s: p1.period.T_s, T2_s: p2.period.T_s, sum_term: b.sum_term, difference_term: b.difference_term },
      expected_g_m_s2: expected,
    },
  };
}

/** Repeated journals about one pivot: the weighted mean of their periods (the amplitude part is shared, so averaged). */
function meanPeriod(ps: readonly Required<PivotPeriod>[]): PivotPeriod {
  if (ps.length === 1) return ps[0]!;
  const w = ps.map((p) => 1 / Math.max(Math.hypot(p.u_stat_s, p.u_clock_s), 1e-12) ** 2);
  const W = w.reduce((s, v) => s + v, 0);
  const mean = (f: (p: Required<PivotPeriod>) => number): number => ps.reduce((s, p, i) => s + w[i]! * f(p), 0) / W;
  // Weights ∝ 1/(u_stat² + u_clock²): each part's variance in the mean is Σ w_i² u_i² / W².
  const part = (f: (p: Required<PivotPeriod>) => number): number => Math.sqrt(ps.reduce((s, p, i) => s + (w[i]! * f(p)) ** 2, 0)) / W;
  return { T_s: mean((p) => p.T_s), u_stat_s: part((p) => p.u_stat_s), u_clock_s: part((p) => p.u_clock_s), u_amp_s: mean((p) => p.u_amp_s), u_radius_s: mean((p) => p.u_radius_s) };
}

/** The relative u of one pivot's periods from its flag radius (the largest of its journals). */
function pivotRadiusRel(runs: readonly (CombineRun & { rig: ReversibleRig })[], parts: readonly Required<PivotPeriod>[], pivot: 1 | 2): number {
  return Math.max(0, ...parts.filter((_, i) => runs[i]!.rig.pivot === pivot).map((p) => p.u_radius_s / p.T_s));
}

/** T1 and T2 against the mass position, their crossing and g there. */
function tuningSeries(
  runs: readonly (CombineRun & { rig: ReversibleRig })[],
  journals: ReversibleJournal[],
  parts: readonly Required<PivotPeriod>[],
  expected: number | null,
): CombineOutcome {
  const pts = (p: 1 | 2): SeriesPoint[] =>
    runs.flatMap((r, i) => (r.rig.pivot === p ? [{ x_m: r.rig.mass_position_m!, T_s: parts[i]!.T_s, u_s: Math.hypot(parts[i]!.u_stat_s, parts[i]!.u_clock_s) }] : []));
  for (const p of [1, 2] as const) {
    const positions = new Set(pts(p).map((q) => q.x_m)).size;
    if (positions < 2) return fail({ kind: 'tuning-too-few-positions', pivot: p, positions });
  }
  const last = runs[runs.length - 1]!.rig.mass_position_m!;
  const t = tuningCrossing({
    pivot1: pts(1),
    pivot2: pts(2),
    l_m: runs[0]!.rig.edge_distance_m,
    l_u_m: Math.max(...runs.map((r) => r.rig.edge_distance_u_m)),
    clock_u_rel: 0,
    amp_u_rel: Math.max(...parts.map((p) => p.u_amp_s / p.T_s)),
    pivot_u_rel: [pivotRadiusRel(runs, parts, 1), pivotRadiusRel(runs, parts, 2)],
    last_x_m: last,
  });
  if (!t.ok) return fail(t.reason);
  return {
    ok: true,
    result: {
      method: 'reversible',
      g_m_s2: t.g_m_s2,
      g_u_m_s2: t.g_u_m_s2,
      journals,
      budget: t.budget,
      crossing_position_m: t.crossing_m,
      crossing_position_u_m: t.crossing_u_m,
      series: { fit1: t.fit1, fit2: t.fit2, next_move_m: t.next_move_m, last_position_m: last, T_s: t.T_s, T_u_s: t.T_u_s },
      expected_g_m_s2: expected,
    },
  };
}
