// Device lines → state: decoded and tracked records feed the boots' timebase, the beams' passes, the clock inputs and the room.
import type { EdgeRecord, HeartbeatRecord } from '../../protocol/records.ts';
import type { Rig } from '../../protocol/rig.ts';
import type { RoomReading } from '../analysis/room-drift.ts';
import { Beams, type EdgeThresholds } from './beams.ts';
import { BootTimebase } from './boot-timebase.ts';
import { ClockInputs } from './clock-inputs.ts';
import { LinkBaud } from './line-wire-time.ts';
import { LinkHealth } from './link-health.ts';
import type { LiveHello } from './live-state.ts';
import type { Warning } from '../analysis/warning.ts';

/** Options of the intake. */
export interface IntakeOptions extends EdgeThresholds {
  /** Channel of a 1 PPS reference (ignored when it is one of the rig's beams). */
  readonly ppsChannel: number;
  /** A rate error given by the user (ppm): the pass builders time their thresholds with it. */
  readonly givenPpm: number;
}

/** Everything the device lines of a run leave behind. */
export class DeviceIntake {
  readonly timebase = new BootTimebase();
  readonly health = new LinkHealth();
  readonly clockInputs = new ClockInputs();
  /** The section's serial rate: ticks are read before a line is sent, so device times pair with its send start. */
  readonly link = new LinkBaud();
  readonly beams: Beams;
  /** A readings with the boot and ticks at which the sensor was read (placed on the passes' timebase by `roomOn`). */
  readonly room: (Omit<RoomReading, 't_s'> & { readonly boot: number; readonly ticks: number })[] = [];
  hello: LiveHello | null = null;
  /** The room sensor's state from its last `S` record since the last hello (0: reading; SENSOR_FAULTS bits), or null. */
  sensorState: number | null = null;
  /** Host time of the last `A` record (the live view shows the reading's age) and of the one before (its spacing). */
  lastRoomHostUs: number | null = null;
  prevRoomHostUs: number | null = null;
  /** Input levels bitmask and host time of the last heartbeat. */
  levels: number | null = null;
  lastBeatHostUs: number | null = null;
  /**
   * Seconds the device watched the beam with no edge before the first edge of the pendulum's beam (from its hello,
   * on both clocks; null when no hello came or a line was lost or rejected before it): the gate side's evidence.
   */
  quietBeforeFirstPass_s: number | null | undefined;
  private helloSentUs: number | null = null;
  private lossSeen = false;

  constructor(
    private readonly opts: IntakeOptions,
    private readonly rig: () => Rig | null,
    /** The pipeline's warnings, in order of arrival: a boot without a hello adds one. */
    private readonly warnings: Warning[],
  ) {
    this.beams = new Beams(opts, (b) => this.timebase.hz(b) * (1 + opts.givenPpm * 1e-6));
  }

  /**
   * One device line whose LF arrived at `hostUs`. Where host time is paired with the line's ticks (the clock inputs,
   * each boot's first anchor, the quiet time before the first pass), it is the line's send start (line-wire-time.ts).
   */
  data(hostUs: number, line: string): void {
    this.beams.ensure(this.rig());
    const sentUs = this.link.sentUs(hostUs, line);
    const rec = this.health.decode(line);
    if (!rec) return void (this.lossSeen = true);
    const tr = this.health.track(rec);
    if (tr.gap) this.lossSeen = true;
    if (tr.newBoot) {
      this.helloSentUs = null;
      this.beams.each((p) => p.newBoot());
      const w = this.timebase.newBoot(tr.bootIndex, rec.kind === 'H' ? rec : null);
      if (w) this.warnings.push(w);
    } else if (tr.gap) this.beams.each((p) => p.linesLost());
    switch (rec.kind) {
      case 'H':
        this.timebase.hello(rec.hz);
        this.helloSentUs = sentUs;
        this.hello = { fw: rec.fw, mcu: rec.mcu, hz: rec.hz, ch: rec.ch, proto: rec.proto, boot: rec.boot.toString(16).padStart(4, '0') };
        // A device with a room sensor interface follows every hello with its state; one without never sends it.
        this.sensorState = null;
        return;
      case 'S':
        this.sensorState = rec.state;
        return;
      case 'E':
        return this.edge(hostUs, sentUs, rec);
      case 'A': {
        const ticks = this.timebase.timed(sentUs, rec.ticks);
        this.room.push({ boot: this.timebase.boot, ticks, tempC: rec.temp / 100, pressPa: rec.press, rhPct: rec.hum / 1000 });
        this.prevRoomHostUs = this.lastRoomHostUs;
        this.lastRoomHostUs = hostUs;
        return;
      }
      case 'T':
        return this.heartbeat(hostUs, sentUs, rec);
      default:
        return;
    }
  }

  /** The readings on a timebase (ticks of a boot → s): the contract's `ticks` is when the reading was taken. */
  roomOn(joined: (b: number, ticks: number) => number): RoomReading[] {
    return this.room.map(({ boot, ticks, ...r }) => ({ ...r, t_s: joined(boot, ticks) }));
  }

  private edge(hostUs: number, sentUs: number, rec: EdgeRecord): void {
    const ticks = this.timebase.timed(sentUs, rec.ticks);
    const rig = this.rig();
    const boot = this.timebase.boot;
    if (this.quietBeforeFirstPass_s === undefined && rec.ch === (rig ? rig.beams[0].channel : 0))
      this.quietBeforeFirstPass_s = this.helloSentUs !== null && !this.lossSeen ? Math.min(ticks / this.timebase.hz(boot), (sentUs - this.helloSentUs) / 1e6) : null;
    if (this.beams.edge(rig, rec, boot, ticks, hostUs)) return;
    const ch = this.opts.ppsChannel;
    if (rec.ch === ch && rec.edge === 'r' && !rig?.beams.some((b) => b.channel === ch)) this.clockInputs.pulse(boot, ticks);
  }

  private heartbeat(hostUs: number, sentUs: number, rec: HeartbeatRecord): void {
    const ticks = this.timebase.timed(sentUs, rec.ticks);
    const boot = this.timebase.boot;
    this.clockInputs.beat(boot, ticks, sentUs);
    this.health.deviceLost(boot, rec.lost);
    this.levels = rec.levels;
    this.lastBeatHostUs = hostUs;
    this.beams.each((p) => p.advance(boot, ticks));
  }
}
