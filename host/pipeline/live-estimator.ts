// The live swing: the batch stages (sequencing, periods, amplitudes) run on the newest passes with the current clock.
//
// `result()` analyses the whole run; live views need the latest swing several times a second on runs of days, so
// the same stages run on a window of the newest LIVE_WINDOW passes, timed with the clock the full analysis would
// choose now. What the window changes, and why it stays small (test/pipeline/pipeline-live-batch.test.ts checks
// it on every bundled scenario):
// - sequencing starts afresh at the window's first pass: its first passes may be left unsequenced while the
//   beat is found, so the first LIVE_WARMUP passes are not shown;
// - the amplitudes use ω0 = 2π/T0 with T0 reduced from the window's periods, not the run's: amplitudes move by
//   about the relative difference of the two T0s (parts per million on a steady swing);
// - the median half-period that marks a barely clearing pass as slow, and a two-beam run's pairing ω0, come
//   from the window;
// - a window whose passes are all slow (a swing that barely clears the beam, for hours at the end of a night)
//   has no usable period, so T0 comes from its raw periods reduced with their median amplitude
//   (`slowWindowAmplitudes`): at the ≤ 2–3° of such swings the law moves T0 by under 2e-4, and so the amplitudes;
// - the gate's on/off delay difference is not fitted on the window (its amplitudes span too little to pin it): the
//   amplitudes are solved with the delay the latest full analysis calibrated (the prior 0 before the first one),
//   so they move by about the change of that delay over the time since, divided by the transit time;
// - a two-beam run's plane (azimuth, axes) is the batch's plane stage on the window: its ω0 comes from the window's
//   paired passes, which moves the figures at second order only;
// - when the window shows fewer than LIVE_MIN_VALID valid passes (a swing that no longer clears the beam), it is
//   doubled, up to LIVE_WINDOW_MAX passes, so the latest valid swing stays in view as in the full analysis.
import type { Rig } from '../../protocol/rig.ts';
import { periodRatio } from '../analysis/elliptic.ts';
import { passStatus, type SequencedPasses } from '../analysis/passes.ts';
import { transitSolver } from '../analysis/stages/amplitudes.ts';
import { findPeriods, type Periods } from '../analysis/stages/periods.ts';
import { reduceToZeroAmplitude } from '../analysis/stages/reduction.ts';
import { median } from '../analysis/stats.ts';
import { blockHalfAngle } from '../analysis/transit-amplitude.ts';
import type { PassColumnsS } from './beams.ts';
import type { LivePass, LivePlane, LiveRecent } from './live-state.ts';
import { sequencePasses, type SequencingOptions } from './pass-sequencing.ts';

/** Passes the live estimate runs on. */
export const LIVE_WINDOW = 160;
/** Passes at the start of the window that are not shown (the sequencing's beat is found there). */
export const LIVE_WARMUP = 32;
/** A window showing fewer valid passes than this is doubled, up to LIVE_WINDOW_MAX passes. */
export const LIVE_MIN_VALID = 8;
export const LIVE_WINDOW_MAX = 8 * LIVE_WINDOW;

const DEG = 180 / Math.PI;

/** The latest valid swing of a window, as the full analysis' row of that pass shows it. */
export interface LiveSwing {
  /** The two half-periods that make up the period ending at the latest valid pass, older first. */
  readonly halfPeriodsS: readonly [number | null, number | null];
  readonly periodS: number | null;
  readonly transitS: number | null;
  readonly amplitudeDeg: number | null;
  /** The newest pass with the sequencing's verdict on it (null without passes). */
  readonly lastPass: LivePass | null;
  /** The valid passes of the window after its warm-up, oldest first. */
  readonly recent: LiveRecent;
  /** Two beams: the plane at those of them that the plane stage measured; null for one beam. */
  readonly plane: LivePlane | null;
}

/**
 * Amplitudes (rad) of the valid passes of a window without a usable period: ω0 from the median raw period (every
 * second pass, slow ones included), reduced to zero amplitude with the median amplitude, two rounds.
 */
function slowWindowAmplitudes(p: SequencedPasses, per: Periods, rig: Rig, delayS: number): Float64Array {
  const amp = new Float64Array(p.t.length).fill(NaN);
  const raw: number[] = [];
  for (let c = 0; c < p.t.length; c++) if (per.start[c]! >= 0) raw.push(p.td[c]! - p.td[per.start[c]!]!);
  if (!raw.length) return amp;
  const phiB = blockHalfAngle(rig.flag_width_m, rig.length_m);
  let t0 = median(raw);
  for (let round = 0; round < 2; round++) {
    const solve = transitSolver(p.transit, phiB, (2 * Math.PI) / t0, delayS);
    for (let c = 0; c < amp.length; c++) amp[c] = p.index[c]! >= 0 ? solve(c) : NaN;
    const a = median([...amp].filter(Number.isFinite));
    if (!Number.isFinite(a)) break;
    t0 = median(raw) / periodRatio(a);
  }
  return amp;
}

const orNull = (v: number | undefined): number | null => (v !== undefined && Number.isFinite(v) ? v : null);

/** The valid pass numbered one before `c` in its segment, or −1. */
function previousInBeat(p: SequencedPasses, c: number): number {
  for (let q = c - 1; q >= 0; q--) if (p.index[q]! >= 0) return p.segment[q] === p.segment[c] && p.index[q] === p.index[c]! - 1 ? q : -1;
  return -1;
}

/** The window's valid passes after the warm-up, as parallel arrays. */
function recentOf(p: SequencedPasses, per: Periods, amp: Float64Array, from: number): LiveRecent {
  const r = { t_s: [] as number[], period_s: [] as (number | null)[], amplitude_deg: [] as (number | null)[], transit_s: [] as number[] };
  for (let c = from; c < p.t.length; c++) {
    if (p.index[c]! < 0) continue;
    r.t_s.push(p.t[c]!);
    r.period_s.push(orNull(per.period[c]));
    r.amplitude_deg.push(orNull(amp[c]! * DEG));
    r.transit_s.push(p.transit[c]!);
  }
  return r;
}

/** The plane at the window's valid passes after the warm-up that the plane stage measured. */
function planeOf(p: SequencedPasses, plane: PassColumnsS['plane'], from: number): LivePlane | null {
  if (!plane) return null;
  const r = { t_s: [] as number[], azimuth_deg: [] as number[], minor_axis_m: [] as number[], semi_major_m: [] as number[] };
  for (let c = from; c < p.t.length; c++) {
    if (p.index[c]! < 0 || !Number.isFinite(plane.azimuthDeg[c]!)) continue;
    r.t_s.push(p.t[c]!);
    r.azimuth_deg.push(plane.azimuthDeg[c]!);
    r.minor_axis_m.push(plane.minorM[c]!);
    r.semi_major_m.push(plane.semiMajorM[c]!);
  }
  return r;
}

/**
 * Runs sequencing, periods and the reduction on a window of passes (`cols`, the newest last), amplitudes solved with
 * the gate delay difference `delayS` (s).
 */
export function liveSwing(cols: PassColumnsS, rig: Rig | null, sequencing: SequencingOptions | undefined, delayS = 0): LiveSwing {
  const n = cols.t.length;
  const seq = sequencePasses(cols.t, cols.transit, cols.boot, sequencing);
  const p: SequencedPasses = { t: cols.t, td: cols.td, transit: cols.transit, index: seq.index, segment: seq.segment, status: seq.status, bridgedBefore: seq.bridgedBefore };
  const per = findPeriods(p);
  const red = reduceToZeroAmplitude(p, per, rig, delayS);
  const amp = red.T0mean === null && rig ? slowWindowAmplitudes(p, per, rig, delayS) : red.amp;
  const from = n > LIVE_WARMUP ? LIVE_WARMUP : 0;
  let c = n - 1;
  while (c >= from && seq.index[c]! < 0) c--;
  const lastPass = n ? { t_s: cols.t[n - 1]!, status: passStatus(seq.status, n - 1) } : null;
  const recent = recentOf(p, per, amp, from);
  const plane = planeOf(p, cols.plane, from);
  if (c < from) return { halfPeriodsS: [null, null], periodS: null, transitS: null, amplitudeDeg: null, lastPass, recent, plane };
  const prev = previousInBeat(p, c);
  return {
    halfPeriodsS: [prev >= 0 ? orNull(per.half[prev]) : null, orNull(per.half[c])],
    periodS: orNull(per.period[c]),
    transitS: cols.transit[c]!,
    amplitudeDeg: orNull(amp[c]! * DEG),
    lastPass,
    recent,
    plane,
  };
}
