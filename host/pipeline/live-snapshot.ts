// The pipeline's live snapshot: the clock the full analysis would choose now, and the live estimator on the newest passes.
//
// Both are cached, so a view asking several times a second pays for the estimate about once per pass: the live swing
// is computed again only when a pass (or the pending one) or the clock changed; the clock is chosen again on a new
// boot or hello rate, and when the heartbeats and pulses grew by CLOCK_REFIT_FRACTION since the last choice (every
// one of them in the first 1000). Choosing costs time in proportion to the run (tens of ms at 10 h), so on a week's
// run this keeps it near a ms per second; the rate it leaves out moves by far less than its uncertainty (a 10 h run's
// host fit moved 1.3 ppm in 9 h, so a lag of 0.1 % of the run moves periods by ~1e-9).
import type { Rig } from '../../protocol/rig.ts';
import { SENSOR_FAULTS } from '../../protocol/records.ts';
import { airDensityCipm2007 } from '../analysis/air-density.ts';
import { hostCalibrationStart, type ClockOption } from './clock-choice.ts';
import type { RunClock } from './clock-inputs.ts';
import type { DeviceIntake } from './device-intake.ts';
import { LIVE_MIN_VALID, LIVE_WINDOW, LIVE_WINDOW_MAX, liveSwing, type LiveSwing } from './live-estimator.ts';
import type { LiveClock, LiveRoom, LiveState } from './live-state.ts';
import type { SequencingOptions } from './pass-sequencing.ts';

/** The live clock is chosen again when the heartbeats and pulses grew by this fraction since the last choice. */
const CLOCK_REFIT_FRACTION = 1e-3;

/** Builds live snapshots of an intake. */
export interface LiveSnapshots {
  /** `delayS`: the gate delay difference the latest full analysis calibrated (s), used for the amplitudes. */
  snapshot(lastHostUs: number | null, nowHostUs: number | null, delayS: number): LiveState;
}

/** The live clock state of a chosen clock; the host-calibration time only for the automatic choice. */
function liveClockOf(option: ClockOption, rc: RunClock): LiveClock {
  const c = rc.clock;
  // A foreign timebase (a simulator faster than real time) stays nominal: no calibration is coming.
  const auto = option === undefined && c.foreign_rate === undefined && (c.source === 'nominal' || c.source === 'host');
  return { source: c.source, ppm: c.ppm, u_ppm: c.u_ppm, hostCalibrationFrom_s: auto ? hostCalibrationStart(rc.beats) : null };
}

/**
 * The room sensor's state and latest reading; null when the run has shown no sensor: no S at all, or only
 * `absent` and never a reading (the reference board with no sensor fitted says `absent` after each hello).
 */
function liveRoomOf(intake: DeviceIntake): LiveRoom | null {
  const last = intake.room.at(-1);
  if (!last && (intake.sensorState === null || intake.sensorState === SENSOR_FAULTS.absent)) return null;
  const at = intake.lastRoomHostUs;
  const reading = last && at !== null ? { tempC: last.tempC, pressPa: last.pressPa, rhPct: last.rhPct, airDensity_kg_m3: airDensityCipm2007(last), host_s: at / 1e6 } : null;
  const prev = intake.prevRoomHostUs;
  return { sensorState: intake.sensorState, reading, spacing_s: at !== null && prev !== null ? (at - prev) / 1e6 : null };
}

/** Live snapshots of `intake` under the pipeline's clock option and sequencing. */
export function liveSnapshots(intake: DeviceIntake, rig: () => Rig | null, option: ClockOption, sequencing: SequencingOptions | undefined): LiveSnapshots {
  const tb = intake.timebase;
  let clockKey = '';
  let clock: { rc: RunClock; live: LiveClock } | null = null;
  let swingKey = '';
  let swing: LiveSwing | null = null;

  let clockSize = 0;
  const currentClock = (): { rc: RunClock; live: LiveClock } => {
    const size = intake.clockInputs.size;
    const boots = `${tb.count}:${tb.hz(tb.boot)}`;
    if (clock && boots === clockKey.split('/')[0] && size - clockSize < Math.max(1, clockSize * CLOCK_REFIT_FRACTION)) return clock;
    const rc = intake.clockInputs.choose(option, tb.count, (b) => tb.hz(b), tb.hz(0), []);
    clockKey = `${boots}/${size}`;
    clockSize = size;
    return (clock = { rc, live: liveClockOf(option, rc) });
  };

  const currentSwing = (rc: RunClock, delayS: number): LiveSwing => {
    const key = `${clockKey}:${intake.beams.version()}:${delayS}`;
    if (swing && key === swingKey) return swing;
    const n = intake.beams.count();
    let s: LiveSwing;
    for (let w = LIVE_WINDOW; ; w *= 2) {
      const cols = intake.beams.columns(Math.max(0, n - w), tb.joiner(rc.k, rc.offsets, rc.since), (b) => tb.hz(b) * rc.k, rig(), rc.since);
      s = liveSwing(cols, rig(), sequencing, delayS);
      if (s.recent.t_s.length >= LIVE_MIN_VALID || w >= n || 2 * w > LIVE_WINDOW_MAX) break;
    }
    swingKey = key;
    return (swing = s);
  };

  return {
    snapshot(lastHostUs, nowHostUs, delayS) {
      const c = currentClock();
      const s = currentSwing(c.rc, delayS);
      const now = nowHostUs ?? lastHostUs;
      const beat = intake.lastBeatHostUs;
      const a = intake.beams.a;
      return {
        hello: intake.hello,
        bootIndex: tb.boot,
        lastHostUs,
        heartbeatAgeS: beat !== null && now !== null ? (now - beat) / 1e6 : null,
        levels: intake.levels,
        blocked: a?.blocked ?? false,
        passes: a?.passes.length ?? 0,
        halfPeriodsS: s.halfPeriodsS,
        periodS: s.periodS,
        transitS: s.transitS,
        amplitudeDeg: s.amplitudeDeg,
        lastPass: s.lastPass,
        clock: c.live,
        counts: intake.health.counts(a?.counts ?? null),
        lineRejections: intake.health.lineRejections(),
        recent: s.recent,
        room: liveRoomOf(intake),
        plane: s.plane,
      };
    },
  };
}
