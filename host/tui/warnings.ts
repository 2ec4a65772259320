// The live view's warnings: the analysis' own (typed, from the result) after the few that depend on the time now
// (a silent device, no passes, a lost link). Thresholds: host/analysis/warning.ts; words: host/output/warning-words.ts.
import { WARN, type Warning, type WarningKind } from '../analysis/warning.ts';
import { warningText } from '../output/warning-words.ts';
import { AIR_DEFAULT_S } from '../../protocol/link-defaults.ts';

export interface ViewWarning {
  readonly kind: WarningKind;
  readonly text: string;
}

export interface WarningInput {
  /** Host seconds now, on the run's time base (estimated between lines). */
  readonly now_s: number;
  /** Host seconds of the last valid pass, or null before the first. */
  readonly lastPass_s: number | null;
  /** Host seconds since which the run has been watched (first line), for the no-pass rule before any pass. */
  readonly since_s: number;
  /** The period to expect: T0, the last period, or one from the rig's length. */
  readonly expectedPeriod_s: number | null;
  readonly lastHeartbeat_s: number | null;
  /** Usual spacing of heartbeats, or null when not yet known. */
  readonly heartbeatInterval_s: number | null;
  /** The source is live (lines still expected); a finished recording or replay warns about nothing stale. */
  readonly expectingLines: boolean;
  readonly disconnected: boolean;
  /** The beam is blocked now (the bob may be resting in it, or swinging inside the flag). */
  readonly blocked?: boolean;
  /** The last measured amplitude, and the half-angle over which the bob blocks the beam (both degrees). */
  readonly lastAmplitude_deg?: number | null;
  readonly beamHalfAngle_deg?: number | null;
  /** Pendulum length and flag width (m), to say the swing's size in millimetres. */
  readonly length_m?: number | null;
  readonly flagWidth_m?: number | null;
  /**
   * The room sensor while it reports readings (state 0): the last reading's arrival and the spacing of the last two
   * (the board's default interval before two came); null without a sensor, or while the sensor says it is faulted.
   */
  readonly room?: { readonly lastReading_s: number; readonly spacing_s: number | null } | null;
  /** The analysis' warnings (AnalysisResult.warnings). */
  readonly analysis: readonly Warning[];
}

const RAD = Math.PI / 180;

/** Why no pass came: the bob swinging inside the flag, resting in the beam, a swing died down, or unknown. */
function noPassesWhy(w: WarningInput): Pick<Extract<Warning, { kind: 'no-passes' }>, 'why' | 'swing_mm' | 'flag_mm'> {
  const dying = w.lastAmplitude_deg != null && w.beamHalfAngle_deg != null && w.lastAmplitude_deg < WARN.dyingSwingFactor * w.beamHalfAngle_deg;
  // A swing down to the flag's width is still a swing, blocked beam or not: say its size, never "resting".
  if (dying && w.length_m && w.flagWidth_m)
    return { why: 'small-swing', swing_mm: w.length_m * Math.sin(w.lastAmplitude_deg! * RAD) * 1000, flag_mm: w.flagWidth_m * 1000 };
  if (w.blocked) return { why: 'blocked' };
  return { why: dying ? 'dying' : 'unknown' };
}

/** The warnings that depend on the time now (none once the source has ended). */
function staleWarnings(w: WarningInput): Warning[] {
  const out: Warning[] = [];
  if (w.disconnected) out.push({ kind: 'disconnected' });
  if (!w.expectingLines || w.disconnected) return out;
  if (w.expectedPeriod_s !== null && w.expectedPeriod_s > 0) {
    const silent = w.now_s - (w.lastPass_s ?? w.since_s);
    if (silent > WARN.silentPeriods * w.expectedPeriod_s) out.push({ kind: 'no-passes', silent_s: silent, periods: silent / w.expectedPeriod_s, ...noPassesWhy(w) });
  }
  if (w.lastHeartbeat_s !== null && w.heartbeatInterval_s !== null && w.heartbeatInterval_s > 0) {
    const gap = w.now_s - w.lastHeartbeat_s;
    if (gap > WARN.silentHeartbeats * w.heartbeatInterval_s) out.push({ kind: 'heartbeats-missing', gap_s: gap });
  }
  // A silent board is already said; the room is worth a line of its own only while the heartbeats come.
  if (w.room && !out.some((x) => x.kind === 'heartbeats-missing')) {
    const interval = w.room.spacing_s ?? AIR_DEFAULT_S;
    const age = w.now_s - w.room.lastReading_s;
    if (interval > 0 && age > WARN.silentRoomReadings * interval) out.push({ kind: 'room-reading-stale', age_s: age, interval_s: interval });
  }
  return out;
}

/** The warnings to show, most urgent first: the live ones, then the analysis' in its order. */
export function warningsFor(w: WarningInput): ViewWarning[] {
  return [...staleWarnings(w), ...w.analysis].map((x) => ({ kind: x.kind, text: warningText(x) }));
}
