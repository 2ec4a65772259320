// What the analysis receives: passes after sequencing, each with a named status, and the clock that timed them.
import type { RateTrack } from './clock-track.ts';
import type { Warning } from './warning.ts';
import type { RoomReading } from './room-drift.ts';
import type { RunPlane } from './plane-of-run.ts';
import type { Rig } from '../../protocol/rig.ts';
import type { AnalysisResult, RunCounts } from './result.ts';

/**
 * What sequencing made of a pass: `valid` (numbered in the swing's beat), `rejected-transit` (its transit is unlike
 * its neighbours'), `rejected-timing` (off the beat), `unsequenced` (left out without blame: too few passes in a row
 * to start a beat, or a swing that no longer clears the beam).
 */
export const PASS_STATUSES = ['valid', 'rejected-transit', 'rejected-timing', 'unsequenced'] as const;
export type PassStatus = (typeof PASS_STATUSES)[number];

/** A status as stored in a pass column (one byte per pass, so a week of passes stays small): its place in PASS_STATUSES. */
export const STATUS_CODE: { readonly [K in PassStatus]: number } = { valid: 0, 'rejected-transit': 1, 'rejected-timing': 2, unsequenced: 3 };

/** The status of pass `i` of a status column. */
export function passStatus(column: ArrayLike<number>, i: number): PassStatus {
  return PASS_STATUSES[column[i]!]!;
}

/** Passes after sequencing (see host/pipeline/pass-sequencing.ts), parallel columns. */
export interface SequencedPasses {
  /** Pass time, s since the journal start (device clock corrected, boots joined on the host clock). */
  readonly t: ArrayLike<number>;
  /**
   * Pass time, s since its boot's tick 0 (device clock corrected): every interval is taken from these, so the
   * numbers do not depend on the host times at all within a boot.
   */
  readonly td: ArrayLike<number>;
  /** Transit time, s (device clock corrected). */
  readonly transit: ArrayLike<number>;
  /** Pass number within its segment; −1 unless valid. */
  readonly index: ArrayLike<number>;
  readonly segment: ArrayLike<number>;
  /** STATUS_CODE of each pass (read with `passStatus`). */
  readonly status: ArrayLike<number>;
  readonly bridgedBefore: ArrayLike<number>;
}

/** The clock correction that was applied to the pass times. */
export interface ClockApplied {
  readonly source: AnalysisResult['clock_source'];
  readonly ppm: number;
  readonly u_ppm: number;
  /** False when the rate was not measured (nominal or given). */
  readonly measured: boolean;
  readonly drift_ppm_per_h: number | null;
  readonly span_s: number | null;
  readonly residuals: { readonly host_s: number[]; readonly residual_s: number[] };
  /**
   * Set when the device's ticks ran at a rate no oscillator has against the host clock (a simulator faster than
   * real time, a wrong tick rate in the hello): the device seconds per host second. Times then stay on the device
   * clock, each boot anchored at its first line, not joined on the host clock.
   */
  readonly foreign_rate?: number;
  /**
   * The rate tracked through the run (clock-track.ts), when the heartbeats show it moving: pass times then follow
   * its integral, and `ppm`, `u_ppm` are its mean over the heartbeats' span.
   */
  readonly track?: RateTrack;
}

/** Everything the analysis needs. */
export interface RunData {
  readonly rig: Rig | null;
  readonly passes: SequencedPasses;
  readonly clock: ClockApplied;
  readonly counts: RunCounts;
  readonly run: AnalysisResult['run'];
  readonly warnings: readonly Warning[];
  /**
   * Seconds the device was seen watching the beam, with no edge, before the first pass (from its hello), or null:
   * longer than a half-period means the bob was at rest, so the first pass followed the release (gate side known).
   */
  readonly quietBeforeFirstPass_s?: number | null;
  readonly settings: AnalysisResult['settings'];
  readonly lineRejections?: AnalysisResult['line_rejections'];
  /** Standard uncertainty of the sensor's blocking − unblocking delay difference, s (default 5 µs). */
  readonly delayDifferenceU_s?: number;
  /** Room readings (A records) on the passes' time axis. */
  readonly room?: readonly RoomReading[];
  /** Build the per-pass rows (default true); a summary or --json does not need them. */
  readonly rows?: boolean;
  /** The swing plane of a two-beam run, aligned with the passes (its corrected transits already in `passes.transit`). */
  readonly plane?: RunPlane | null;
}
