// The warning line's rules: things the user must act on, decided from a snapshot (pure, typed reasons).
import type { BudgetLine } from '../analysis/result.ts';

export type WarningReason = 'no-passes' | 'gate-offset' | 'clock-dominates' | 'heartbeats-missing' | 'disconnected';

export interface ViewWarning {
  readonly reason: WarningReason;
  readonly text: string;
}

/** A gate this far from the lowest point (and clear of its uncertainty) is worth moving: common practice, no source. */
export const GATE_OFFSET_WARN_M = 0.002;
/** Silence for this many expected periods means the swing, the gate or the device needs a look (the rule). */
export const SILENT_PERIODS = 3;
/** Heartbeats missing for this many of their usual intervals (the same rule as the link's). */
export const SILENT_HEARTBEATS = 3;
/** The clock term "dominates" when it carries more than half of the combined variance of g. */
export const CLOCK_SHARE_WARN = 0.5;

export interface WarningInput {
  /** Host seconds now, on the run's time base (estimated between lines). */
  readonly now_s: number;
  /** Host seconds of the last valid pass, or null before the first. */
  readonly lastPass_s: number | null;
  /** Host seconds since which the run has been watched (first line), for the no-pass rule before any pass. */
  readonly since_s: number;
  /** The period to expect: T0, the last period, or one from the rig's length. */
  readonly expectedPeriod_s: number | null;
  readonly gateOffset_m: number | null;
  readonly gateOffset_u_m: number | null;
  readonly budget: readonly BudgetLine[];
  readonly lastHeartbeat_s: number | null;
  /** Usual spacing of heartbeats, or null when not yet known. */
  readonly heartbeatInterval_s: number | null;
  /** The source is live (lines still expected); a finished replay warns about nothing stale. */
  readonly expectingLines: boolean;
  readonly disconnected: boolean;
  /** The beam is blocked now (the bob may be resting in it). */
  readonly blocked?: boolean;
  /** The last measured amplitude, and the half-angle over which the bob blocks the beam (both degrees). */
  readonly lastAmplitude_deg?: number | null;
  readonly beamHalfAngle_deg?: number | null;
}

/** An amplitude within this factor of the beam's half-angle barely clears the beam: common practice, no source. */
export const DYING_SWING_FACTOR = 1.5;

/** Fraction of the combined variance of g carried by budget lines about the clock. */
export function clockShare(budget: readonly BudgetLine[]): number {
  let total = 0;
  let clock = 0;
  for (const b of budget) {
    const v = b.u_rel_g * b.u_rel_g;
    total += v;
    if (/clock|timebase|oscillator/i.test(b.name)) clock += v;
  }
  return total > 0 ? clock / total : 0;
}

/** The warnings to show, most urgent first. */
export function warningsFor(w: WarningInput): ViewWarning[] {
  const out: ViewWarning[] = [];
  if (w.disconnected) out.push({ reason: 'disconnected', text: 'device disconnected: check the cable; reconnecting' });
  if (w.expectingLines && !w.disconnected && w.expectedPeriod_s !== null && w.expectedPeriod_s > 0) {
    const from = w.lastPass_s ?? w.since_s;
    const silent = w.now_s - from;
    if (silent > SILENT_PERIODS * w.expectedPeriod_s) {
      const head = `no passes for ${silent.toFixed(0)} s (${(silent / w.expectedPeriod_s).toFixed(0)} periods)`;
      const dying = w.lastAmplitude_deg != null && w.beamHalfAngle_deg != null && w.lastAmplitude_deg < DYING_SWING_FACTOR * w.beamHalfAngle_deg;
      const why = w.blocked
        ? 'the beam stays blocked: is the bob resting in it?'
        : dying
          ? 'the swing has died down to the beam width: release it again, then press r'
          : 'is it swinging through the beam?';
      out.push({ reason: 'no-passes', text: `${head}: ${why}` });
    }
  }
  if (w.expectingLines && !w.disconnected && w.lastHeartbeat_s !== null && w.heartbeatInterval_s !== null && w.heartbeatInterval_s > 0) {
    const gap = w.now_s - w.lastHeartbeat_s;
    if (gap > SILENT_HEARTBEATS * w.heartbeatInterval_s) out.push({ reason: 'heartbeats-missing', text: `no heartbeat for ${gap.toFixed(0)} s: device stalled or link lost?` });
  }
  if (w.gateOffset_m !== null && Math.abs(w.gateOffset_m) > GATE_OFFSET_WARN_M && Math.abs(w.gateOffset_m) > 2 * (w.gateOffset_u_m ?? 0))
    out.push({ reason: 'gate-offset', text: `gate ${(Math.abs(w.gateOffset_m) * 1000).toFixed(1)} mm off the lowest point: ${gateHint(w.gateOffset_m, w.gateOffset_u_m)} to centre it` });
  const share = clockShare(w.budget);
  if (share > CLOCK_SHARE_WARN)
    out.push({ reason: 'clock-dominates', text: `clock uncertainty is ${(share * 100).toFixed(0)}% of the g budget: run longer for a better clock fit` });
  return out;
}

/**
 * Which way to move the gate. The analysis signs the offset positive when the beam sits toward the side the
 * bob was on before the first recorded pass (the release side), so a positive offset moves away from it.
 */
export function gateHint(offset_m: number | null, u_m: number | null): string {
  if (offset_m === null || !Number.isFinite(offset_m)) return 'not known yet';
  const mm = Math.abs(offset_m) * 1000;
  if (Math.abs(offset_m) <= Math.max(2 * (u_m ?? 0), 0.0002)) return 'centred';
  return `move ${mm.toFixed(1)} mm ${offset_m > 0 ? 'away from' : 'toward'} release side`;
}
