// Stage: the uncertainty budget of T0 and g (GUM, JCGM 100:2008): statistics, clock, flag width, sensor delays,
// length and every correction, as relative standard uncertainties of g (k = 1).
import type { Rig } from '../../../protocol/rig.ts';
import { maskedMean, reducePeriods } from '../period-law.ts';
import type { ClockApplied, SequencedPasses } from '../passes.ts';
import type { GateDelay } from '../delay-fit.ts';
import type { BudgetLine, CorrectionLine } from '../result.ts';
import { batchMeansStdError } from '../stats.ts';
import type { T0Line } from '../t0-line-fit.ts';
import { blockHalfAngle } from '../transit-amplitude.ts';
import { combineBudget } from '../uncertainty-budget.ts';
import { fillPeriodAmplitudes, transitSolver } from './amplitudes.ts';
import type { Corrected } from './corrections.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

/** The budget, T0's standard uncertainty and g's. */
export interface Budget {
  readonly rows: BudgetLine[];
  /** Standard uncertainty of the corrected T0 (s): statistics, clock, flag width and delays (no length, no corrections). */
  readonly T0_u: number | null;
  readonly g_u: number | null;
  /** Relative standard uncertainty of T0 from the statistics alone (NaN when unknown). */
  readonly statRel: number;
}

/** What the budget stage reads. */
export interface BudgetInput {
  readonly rig: Rig | null;
  readonly passes: SequencedPasses;
  readonly periods: Periods;
  readonly reduction: Reduction;
  readonly line: T0Line | null;
  /** T0 of the line (or the mean of periods), s. */
  readonly T0: number | null;
  readonly corrected: Corrected;
  readonly clock: ClockApplied;
  /**
   * The sensor's on/off delay difference the amplitudes were solved with (s), where it came from, its statistical
   * uncertainty and its shift with the flag width (the flag-width row moves both).
   */
  readonly delay: Pick<GateDelay, 'difference_s' | 'difference_u_s' | 'statistical_u_s' | 'width_shift_s' | 'source'>;
  /** The room's rows (stages/environment.ts) and T0's relative uncertainty from carrying it to the reference temperature. */
  readonly room?: { readonly rows: readonly BudgetLine[]; readonly T0_rel: number };
}

/**
 * How far a systematic change of the transit solution moves the mean reduced period (relative): every amplitude
 * solved again with the input moved (the effect grows like θ³, so one operating point would not do), on an even
 * subsample of ≤ ~4000 periods, plenty for the size of a systematic shift. Either estimator of T0 moves alike.
 */
function reductionShift(b: BudgetInput, phiB: number, dTransit: number): number {
  const { periods: per, reduction: red } = b;
  if (!b.rig || red.T0mean === null) return 0;
  const a2 = new Float64Array(b.passes.t.length).fill(NaN);
  const pa = new Float64Array(per.ends.length).fill(NaN);
  const step = Math.max(1, Math.floor(per.ends.length / 4000));
  const sub = new Uint8Array(per.ends.length);
  for (let k = 0; k < per.ends.length; k += step) sub[k] = red.keep[k]!;
  fillPeriodAmplitudes(per, b.passes.index, transitSolver(b.passes.transit, phiB, (2 * Math.PI) / red.T0mean, dTransit), a2, pa, step);
  return Math.abs(maskedMean(reducePeriods(per.P, pa), sub) / maskedMean(red.P0, sub) - 1);
}

/** Relative standard uncertainty of T0 from its statistics: the line's, else batch means of the kept reduced periods. */
function statisticsRel(b: BudgetInput): { rel: number; used: number } {
  const used: number[] = [];
  for (let i = 0; i < b.reduction.P0.length; i++) if (b.reduction.keep[i] === 1) used.push(b.reduction.P0[i]!);
  const rel = b.line && b.T0 !== null ? b.line.u_T0 / b.T0 : b.T0 !== null && used.length > 1 ? batchMeansStdError(used) / b.T0 : NaN;
  return { rel, used: used.length };
}

/** A correction's line: applied ones count their own u, else 10 % of their size (assumed, no source); unapplied ones a rectangular half-width. */
function correctionRow(line: CorrectionLine): BudgetLine {
  const u = line.u_rel ?? (line.applied ? 0.1 * Math.abs(line.period_rel) : Math.abs(line.period_rel) / Math.sqrt(3));
  return { id: line.id, name: `${line.applied ? 'correction' : 'uncorrected'}: ${line.name}`, u_rel_g: 2 * u, note: line.why };
}

/** The budget stage (empty without T0). */
export function uncertaintyBudget(b: BudgetInput): Budget {
  const stat = statisticsRel(b);
  const { rig, clock, corrected } = b;
  if (corrected.T0 === null) return { rows: [], T0_u: null, g_u: null, statRel: stat.rel };
  const rows: BudgetLine[] = [];
  const dl = b.delay;
  const uRedW = rig ? reductionShift(b, blockHalfAngle(rig.flag_width_m + rig.flag_width_u_m, rig.length_m), dl.difference_s + dl.width_shift_s) : 0;
  const uRedD = rig ? reductionShift(b, b.reduction.phiB, dl.difference_s + dl.statistical_u_s) : 0;
  const uClock = clock.u_ppm * 1e-6;
  const line = b.line;
  if (Number.isFinite(stat.rel))
    rows.push({
      id: 'statistics',
      name: 'period timing (statistics)',
      u_rel_g: 2 * stat.rel,
      note: line ? { kind: 't0-line', passes: line.passes, white_s: line.sigmaWhite_s, walk_s: line.sigmaWalk_s } : { kind: 'periods', count: stat.used },
    });
  rows.push({ id: 'clock', name: `device clock (${clock.source})`, u_rel_g: 2 * uClock, note: { kind: 'clock-rate', ppm: clock.ppm, u_ppm: clock.u_ppm } });
  if (rig) {
    rows.push({ id: 'flag-width', name: 'flag width (amplitude reduction)', u_rel_g: 2 * uRedW, note: { kind: 'flag-width', m: rig.flag_width_m, u_m: rig.flag_width_u_m } });
    rows.push({ id: 'delay-difference', name: 'sensor on/off delay difference (amplitude reduction)', u_rel_g: 2 * uRedD,
      note: { kind: 'delay-difference', source: dl.source, s: dl.difference_s, u_s: dl.difference_u_s },
    });
  }
  rows.push(...(b.room?.rows.filter((r) => r.id === 'room-T0') ?? []));
  const T0_u = corrected.T0 * Math.hypot(Number.isFinite(stat.rel) ? stat.rel : 0, uClock, uRedW, uRedD, b.room?.T0_rel ?? 0);
  const model = corrected.model;
  if (!rig || !model || corrected.g === null) return { rows, T0_u, g_u: null, statRel: stat.rel };
  rows.unshift({ id: 'length', name: 'length L (pivot to bob centre)', u_rel_g: rig.length_u_m / model.L_eff_m, note: { kind: 'length', symbol: 'L', m: rig.length_m, u_m: rig.length_u_m } });
  rows.push(...(b.room?.rows.filter((r) => r.id === 'room-length') ?? []));
  for (const l of model.lines) if (l.period_rel !== 0) rows.push(correctionRow(l));
  return { rows, T0_u, g_u: corrected.g * combineBudget(rows), statRel: stat.rel };
}
