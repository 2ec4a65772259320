// What really happened in a simulated run: the true parameters, the swing, and every fault with exact counts.
import type { FaultSchedule } from './fault-schedule.ts';
import type { MeasuredDraw } from './measured-rig.ts';
import type { TruePhysics } from './physics.ts';

/** Exact fault counts, filled in while the run's lines are iterated. */
export interface FaultCounts {
  /** Lines the device put on the wire (every boot). */
  lines_sent: number;
  /** Lines delivered to the host: journal data lines, or lines written to the pty. */
  lines_journaled: number;
  /** Lines lost on the wire (the `lost_lines` fault). */
  lines_lost: number;
  /** Lines journaled with one byte replaced (the `corrupt` fault). */
  lines_corrupted: number;
  /** Lines that arrived while the host was disconnected. */
  lines_in_disconnect: number;
  /** Lines formed but still unsent in the device when it reset. */
  lines_cut_by_reboot: number;
  reboots: number;
  disconnects: number;
  stalls: number;
  device_drop_windows: number;
  /** Edges the device counted in `lost` (drop windows, stall overflow, missed in the capture blind time). */
  edges_lost_by_device: number;
  /** Of which: the edge buffer overflowed during a stall. */
  edges_lost_in_stall: number;
  /** Edges missed in the capture ISR's blind time (device.min_edge_gap_ticks, pin_check_ticks), counted or not. */
  edges_lost_too_close: number;
  /** Of those, the edges the device never counted in `lost` (missed just before a reset). */
  edges_lost_silently: number;
  /** Edges while the device was resetting (not counted by any device). */
  edges_missed_while_down: number;
  /** Heartbeats that fell due while the device was stalled and were never sent. */
  heartbeats_skipped: number;
  /** Extra pulses (2 edges each) from bounce. */
  bounce_pulses: number;
  /** Objects that crossed the beam. */
  objects: number;
  /** Edges the device captured and queued (all boots). */
  edges_captured: number;
}

export interface BootTruth {
  /** Host seconds since #start when the device came out of reset (tick 0 of this boot, before phase). */
  readonly host_s: number;
  readonly boot_id: number;
  /** Fraction of a tick the counter had at host_s. */
  readonly phase_ticks: number;
  readonly cause: string;
}

/** The swing plane per pass (runs of the spherical model): every stride-th closest approach to the rest point. */
export interface PlaneTruth {
  readonly stride: number;
  readonly beams: { readonly channel: number; readonly angle_deg: number }[];
  /** −Ω_E·sin(latitude) in °/h when the room turns with the Earth, else 0 (counterclockwise from above positive). */
  readonly earth_rate_deg_per_h: number;
  /** Time since release of the closest approach. */
  readonly t_s: number[];
  /** Direction of the horizontal velocity there, ° counterclockwise from above from the reference direction (−180, 180]. */
  readonly azimuth_deg: number[];
  /** Distance from the rest point there, + when the bob goes round counterclockwise from above. */
  readonly minor_axis_m: number[];
  /** Mean of the polar angles of the farthest points before and after (one shorter when the run ends mid-swing). */
  readonly amplitude_deg: number[];
  /** Horizontal speed there. */
  readonly speed_m_s: number[];
}

export interface Truth {
  readonly scenario: string;
  readonly seed: number;
  readonly start: string;
  readonly duration_s: number;
  readonly physics: TruePhysics;
  readonly gate: {
    readonly offset_m: number;
    readonly offset_convention: string;
    readonly flag_width_m: number;
    readonly blocked_level: 'low' | 'high';
    readonly channel: number;
    readonly blocking_delay_us: number;
    readonly unblocking_delay_us: number;
    readonly jitter_us: number;
  };
  readonly clock: {
    readonly hz: number;
    readonly ppm: number;
    readonly drift_ppm_per_h: number;
    readonly capture_latency_ticks: number;
    readonly model: string;
    readonly boots: BootTruth[];
  };
  /** Turning points (t since release = host seconds − release_host_s, signed amplitude), every `stride`-th. */
  readonly swings: { stride: number; t_s: number[]; theta_rad: number[] };
  /**
   * Bob entries into and exits from the beam zone (time since release, before sensor delays), every
   * `stride`-th pair, with the signed amplitude of the turning point the bob swung from. A run that ends
   * during a pass has one more entry than exits.
   */
  readonly passes: { stride: number; enter_s: number[]; exit_s: number[]; amplitude_rad: number[] };
  /** Host seconds since #start at which the bob was released (true time 0 of the swing). */
  readonly release_host_s: number;
  /** Present for runs of the spherical model (a scenario with `plane`, or a rig with `beams`). */
  readonly plane?: PlaneTruth;
  final: { t_s: number; amplitude_rad: number; at_rest: boolean };
  readonly faults: { readonly schedule: FaultSchedule; readonly counts: FaultCounts };
  /** True once the whole run has been generated. */
  complete: boolean;
  /** The rig values the journal states as measured (scenario measured_rig), beside their truth; absent: the journal states the true rig. */
  measured_rig?: { readonly draws: MeasuredDraw[] };
  /** Absent: the device model (sim/device.ts). 'emulated firmware': the shipped firmware in simavr. */
  device?: 'emulated firmware';
}

export function emptyCounts(): FaultCounts {
  return {
    lines_sent: 0,
    lines_journaled: 0,
    lines_lost: 0,
    lines_corrupted: 0,
    lines_in_disconnect: 0,
    lines_cut_by_reboot: 0,
    reboots: 0,
    disconnects: 0,
    stalls: 0,
    device_drop_windows: 0,
    edges_lost_by_device: 0,
    edges_lost_in_stall: 0,
    edges_lost_too_close: 0,
    edges_lost_silently: 0,
    edges_missed_while_down: 0,
    heartbeats_skipped: 0,
    bounce_pulses: 0,
    objects: 0,
    edges_captured: 0,
  };
}

/** Truth as JSON, indented but with number lists on one line (Infinity, e.g. "no linear damping", becomes null). */
export function truthJson(t: Truth): string {
  const text = JSON.stringify(t, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 1);
  return text.replace(/\[\n[-\s\d.,eE+]*\]/g, (m) => m.replace(/\s+/g, ''));
}
