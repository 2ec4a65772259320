// What the live view reads several times a second: the latest swing, the clock, link health and recent points.
import type { RejectReason } from '../../protocol/records.ts';
import type { PassStatus } from '../analysis/passes.ts';
import type { AnalysisResult, RunCounts } from '../analysis/result.ts';

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

/** The newest valid passes, oldest first, parallel arrays, as the full analysis' rows of those passes show them. */
export interface LiveRecent {
  /** Pass time, seconds since the journal's start (the clock of `LiveState.clock`, boots joined on the host clock). */
  readonly t_s: readonly number[];
  /** Full period ending at that pass (null where the analysis has none, e.g. a barely clearing pass). */
  readonly period_s: readonly (number | null)[];
  readonly amplitude_deg: readonly (number | null)[];
  readonly transit_s: readonly number[];
}

/**
 * A two-beam run's swing plane at the window's measured valid passes after its warm-up, oldest first: the plane
 * stage of the batch (host/analysis/plane-of-run.ts) run on the live window. Passes near a beam line are left out.
 */
export interface LivePlane {
  readonly t_s: readonly number[];
  /** Axis direction, ° counterclockwise from above, in the rig's frame. */
  readonly azimuth_deg: readonly number[];
  /** Signed semi-minor axis (m), + when the bob goes round counterclockwise seen from above. */
  readonly minor_axis_m: readonly number[];
  readonly semi_major_m: readonly number[];
}

/** The room as the board's sensor reports it: its state and latest reading. */
export interface LiveRoom {
  /** From the last `S` record since the last hello: 0 reading, else the fault bits of SENSOR_FAULTS; null when none came. */
  readonly sensorState: number | null;
  /** The latest `A` reading as sent, with the air density of those conditions; null before the first one. */
  readonly reading: {
    readonly tempC: number;
    readonly pressPa: number;
    readonly rhPct: number;
    /** CIPM-2007 at the reading's conditions (host/analysis/air-density.ts). */
    readonly airDensity_kg_m3: number;
    /** When it arrived, host seconds since `#start` (the view shows its age against its own "now"). */
    readonly host_s: number;
  } | null;
  /** Host seconds between the last two readings (the board's interval as seen), null before two. */
  readonly spacing_s: number | null;
}

/** The newest pass and what the sequencing made of it (`unsequenced` when the swing no longer clears the beam). */
export interface LivePass {
  readonly t_s: number;
  readonly status: PassStatus;
}

/** The device clock the live figures (and the full result of the same moment) are timed with. */
export interface LiveClock {
  readonly source: AnalysisResult['clock_source'];
  /** Rate error applied (ppm) and its standard uncertainty (nominal: the resonator tolerance, 2887 ppm). */
  readonly ppm: number;
  readonly u_ppm: number;
  /**
   * The automatic choice's switch from the nominal rate to the host-clock fit (host s since `#start`): when it
   * happened (source `host`) or, while nominal, when the heartbeats will span long enough (projected). Null when
   * it does not apply (a clock given or forced, a 1 PPS input) or before the first heartbeat.
   */
  readonly hostCalibrationFrom_s: number | null;
}

/** A snapshot of the pipeline for live views: the batch stages on the newest passes, with the current clock. */
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
  /** Passes so far (blocked intervals of beam A, before sequencing). */
  readonly passes: number;
  /** The latest valid swing (host/pipeline/live-estimator.ts): the half-periods of its period, older first. */
  readonly halfPeriodsS: readonly [number | null, number | null];
  readonly periodS: number | null;
  readonly transitS: number | null;
  readonly amplitudeDeg: number | null;
  /** The newest pass, valid or not. */
  readonly lastPass: LivePass | null;
  readonly clock: LiveClock;
  readonly counts: RunCounts;
  /** Device lines rejected by the decoder, by reason. */
  readonly lineRejections: Readonly<Partial<Record<RejectReason, number>>>;
  readonly recent: LiveRecent;
  /** The room sensor; null while the run has shown none (no `S` or `A` record). */
  readonly room: LiveRoom | null;
  /** The swing plane of the newest passes; null for a one-beam run. */
  readonly plane: LivePlane | null;
}
