// What the live view reads ten times a second: the latest swing, link health and recent points, cheap to build.
import type { RejectReason } from '../../protocol/records.ts';
import type { RunCounts } from '../analysis/result.ts';

/** The device as it introduced itself in its last hello. */
export interface LiveHello {
  readonly fw: string;
  readonly mcu: string;
  readonly hz: number;
  readonly ch: number;
  readonly proto: number;
  /** The boot id, as the 4 hex digits of the wire. */
  readonly boot: string;
}

/** Recent swings for the live plots, oldest first, parallel arrays (at most `RECENT_POINTS`). */
export interface LiveRecent {
  /** Pass time, seconds since the journal's start (host clock, nominal device rate within a boot). */
  readonly t_s: readonly number[];
  /** Full period ending at that pass (null while unknown). */
  readonly period_s: readonly (number | null)[];
  readonly amplitude_deg: readonly (number | null)[];
  readonly transit_s: readonly number[];
}

/** How many recent swings `LiveState.recent` keeps. */
export const RECENT_POINTS = 600;

/** A cheap snapshot of the pipeline for live views; values use the device's nominal clock (or a given ppm). */
export interface LiveState {
  readonly hello: LiveHello | null;
  /** 0 for the first boot seen, +1 per reboot; −1 before any device line. */
  readonly bootIndex: number;
  /** Host time of the last journal entry, µs since `#start`. */
  readonly lastHostUs: number | null;
  /** Seconds since the last heartbeat, measured at `nowHostUs` (or at the last entry). */
  readonly heartbeatAgeS: number | null;
  /** Input levels bitmask of the last heartbeat. */
  readonly levels: number | null;
  /** True while the beam is blocked, from the last edge of the pendulum channel. */
  readonly blocked: boolean;
  /** Valid passes so far (before the batch analysis' neighbour checks). */
  readonly passes: number;
  /** The last two half-periods, older first. */
  readonly halfPeriodsS: readonly [number | null, number | null];
  readonly periodS: number | null;
  readonly transitS: number | null;
  readonly amplitudeDeg: number | null;
  /** Mean full period and its count since the start or the last `restartEstimates`. */
  readonly meanPeriodS: number | null;
  readonly meanPeriodCount: number;
  readonly counts: RunCounts;
  /** Device lines rejected by the decoder, by reason. */
  readonly lineRejections: Readonly<Partial<Record<RejectReason, number>>>;
  readonly recent: LiveRecent;
}
