// The device model: captures pin edges in ticks, sends H/E/T/R/S (and, with a room, A) lines like the firmware, reboots, stalls and drops.
import { encodeRecord } from '../protocol/encode.ts';
import { SEQ_MODULO, type DeviceRecord } from '../protocol/records.ts';
import { AIR_DEFAULT_S, AIR_MAX_S, CHANNEL_LATENCY_TICKS, COMMAND_MAX_BYTES, HEARTBEAT_MAX_MS, HEARTBEAT_MIN_MS } from '../protocol/link-defaults.ts';
import { SENSOR_FAULTS } from '../protocol/records.ts';
import { DeviceClock } from './device-clock.ts';
import type { FaultSchedule, Window } from './fault-schedule.ts';
import type { PinEdge } from './optics.ts';
import type { Rng } from './prng.ts';
import { clockExcursion, roomAt, type RoomSetup } from './room.ts';
import type { Scenario } from './scenario.ts';
import type { BootTruth, FaultCounts } from './truth.ts';

/** A line as it enters the device's UART, host (true) seconds. */
export interface DeviceLine {
  readonly t: number;
  readonly line: string;
}

/** Reset-cause bits of the AVR MCUSR register (PORF, EXTRF, BORF, WDRF; ATmega328P datasheet, MCUSR). */
const RESET_CAUSE: Readonly<Record<string, number>> = { power: 1, external: 2, brownout: 4, watchdog: 8 };
/** Longest host command, in characters without the LF (COMMAND_MAX_LINE in firmware/src/command.h). */
const MAX_COMMAND_CHARS = COMMAND_MAX_BYTES;
const TICKS_MAX = 2 ** 48;
/**
 * Time from a command's LF reaching the device to its reply's first byte in the UART: 426 µs measured on the
 * emulated firmware (parse, format, CRC; test/firmware/firmware-model-parity.test.ts compares the lines).
 */
const REPLY_LATENCY_S = 426e-6;

/** A record before its seq is assigned (at the moment it is sent). */
type Body = DeviceRecord extends infer R ? (R extends DeviceRecord ? Omit<R, 'seq'> : never) : never;
interface Pending {
  at: number;
  /** Host time of what the line reports (a capture, a heartbeat deadline); a command can undo later ones. */
  ev: number;
  body: Body | undefined;
  /** Set when the line was sealed early (a reboot kept it in the UART while seq restarted). */
  line: string | undefined;
  /** For an S line a reading sent: the sensor state before it, restored if a command undoes the reading. */
  reading?: { readonly prior: number | undefined };
}

type Input = 'edge' | 'heartbeat' | 'air' | 'check' | 'reboot' | 'ready' | 'stall' | 'resume';

export interface DeviceOptions {
  readonly device: Scenario['device'];
  readonly channel: number;
  readonly initialLevel: 0 | 1;
  /** Levels of further channels before any edge (a second beam). */
  readonly otherLevels?: readonly { readonly ch: number; readonly level: 0 | 1 }[];
  readonly schedule: FaultSchedule;
  readonly rng: Rng;
  readonly counts: FaultCounts;
  readonly boots: BootTruth[];
  /** No line is formed after this host time. */
  readonly tEnd: number;
  /**
   * A room sensor reading this room (host time since #start), as the firmware's BME280 does. Without one the
   * device is the reference board with no sensor fitted: its sensor interface says `absent` (S 1).
   */
  readonly room?: RoomSetup;
}

export class DeviceModel {
  private readonly cfg: Scenario['device'];
  private readonly rng: Rng;
  private readonly pending: Pending[] = [];
  private readonly levels: number[];
  private nextEdge: PinEdge | undefined;
  private up = false;
  private readyAt: number;
  private readyCause = 'power';
  private clock: DeviceClock | undefined;
  private bootId = 0;
  private rc = 1;
  private seq = 0;
  private lost = 0;
  private mask: number;
  private hbTicksPer = 0;
  private nextHbTicks = Infinity;
  private nextHbAt = Infinity;
  private airTicksPer = 0;
  private nextAirTicks = Infinity;
  private nextAirAt = Infinity;
  /** The room sensor's state as last reported in S (undefined at boot until the first reading or probe). */
  private airState: number | undefined;
  private stalledUntil: number | undefined;
  private stallQueued = 0;
  /** Keeps lines released at the end of a stall in their original order. */
  private stallOrder = 0;
  private lastAt = -Infinity;
  /** The last capture, while the ISR's blind time after it is unresolved (see Scenario device.pin_check_ticks). */
  private window: { at: number; checkAt: number; level: 0 | 1; missed: number } | undefined;
  private ri = 0;
  private si = 0;
  private di = 0;

  constructor(
    private readonly o: DeviceOptions,
    private readonly edges: Iterator<PinEdge>,
  ) {
    this.cfg = o.device;
    this.rng = o.rng;
    this.levels = Array.from({ length: this.cfg.channels }, (_, i) => (i === o.channel ? o.initialLevel : (o.otherLevels?.find((l) => l.ch === i)?.level ?? 1)));
    this.mask = (1 << this.cfg.channels) - 1;
    this.readyAt = this.cfg.first_boot_s;
    this.pullEdge();
  }

  /** Host time at which the next line enters the UART (Infinity when the run is over). */
  peekTime(): number {
    this.settle();
    return this.pending.length ? this.pending[0]!.at : Infinity;
  }

  /** The next line, its seq assigned now (so replies to commands slot in correctly). */
  pop(): DeviceLine | undefined {
    this.settle();
    const p = this.pending.shift();
    if (!p) return undefined;
    this.lastAt = p.at;
    this.o.counts.lines_sent++;
    return { t: p.at, line: p.line ?? this.seal(p.body!) };
  }

  /** A host command line (without LF) arriving at host time t; the reply is queued like the firmware's. */
  command(t: number, text: string): void {
    this.advanceTo(t);
    if (!this.up || this.stalledUntil !== undefined) return;
    const cmdLine = text.replace(/\r$/, '');
    if (cmdLine.length === 0) return;
    const body = this.reply(cmdLine, t);
    const sent = this.queue(Math.max(t + REPLY_LATENCY_S, this.lastAt), body);
    // The firmware's main loop sends the sensor's state right behind a hello, and behind an `A` reply that
    // changed it: off at once; on with no sensor fitted, the probe fails at once and it is `absent` again.
    if (body.kind === 'H' && this.airState !== undefined) this.queue(sent.at, { kind: 'S', state: this.airState });
    if (body.kind === 'R' && body.ok && body.cmd === 'A' && (this.airTicksPer === 0 || !this.o.room)) {
      this.noteSensor(this.airTicksPer === 0 ? SENSOR_FAULTS.off : SENSOR_FAULTS.absent, sent.at);
    }
  }

  /**
   * The room sensor's state as the firmware reports it (firmware/src/room.c): an S line at `at` only when it
   * changes (and after a hello). `readingAt`: the reading that found it, which a later command may undo.
   */
  private noteSensor(state: number, at: number, readingAt?: number): void {
    if (state === this.airState) return;
    const prior = this.airState;
    this.airState = state;
    const p = this.queue(at, { kind: 'S', state }, readingAt);
    if (readingAt !== undefined) p.reading = { prior };
  }

  /** Readings every `s` seconds of device time from `fromTicks` (0: off); none without a sensor fitted. */
  private setAir(s: number, fromTicks: number): void {
    this.airTicksPer = this.cfg.hz * s;
    this.nextAirTicks = s > 0 && this.o.room ? fromTicks : Infinity;
    this.nextAirAt = this.clock!.timeAt(this.nextAirTicks);
  }

  /**
   * A reading rounded as the firmware sends it: hundredths of °C, Pa, thousandths of %RH. The firmware
   * finishes it (measurement, read-out, compensation) about 11 ms after the trigger and sends a changed
   * state in the same pass, just before the A line.
   */
  private onAir(t: number): void {
    const c = roomAt(this.o.room!, t);
    const ticks = Math.floor(this.clock!.ticksAt(t)) % TICKS_MAX;
    const hum = Math.min(100_000, Math.max(0, Math.round(c.rhPct * 1000)));
    const at = Math.max(t + 0.011 + this.emitLatency(), this.lastQueued());
    this.noteSensor(this.airTicksPer > 0 ? 0 : SENSOR_FAULTS.off, at, t);
    this.queue(at, { kind: 'A', ticks, temp: Math.round(c.tempC * 100), press: Math.round(c.pressPa), hum }, t);
    this.nextAirTicks = this.airTicksPer > 0 ? this.nextAirTicks + this.airTicksPer : Infinity;
    this.nextAirAt = this.clock!.timeAt(this.nextAirTicks);
  }

  /** Readings the model took ahead of a command at t (see undoLookahead) never happened on the firmware. */
  private undoReadingsAfter(t: number): void {
    for (let i = this.pending.length - 1; i >= 0; i--) {
      const p = this.pending[i]!;
      if (p.line !== undefined || p.ev <= t || (p.body!.kind !== 'A' && !p.reading)) continue;
      if (p.reading) this.airState = p.reading.prior;
      this.pending.splice(i, 1);
    }
  }

  /** The firmware's grammar (firmware/src/command.c): numbers of any length saturate, so huge values are `range`. */
  private reply(text: string, t: number): Body {
    const c = text[0]!;
    const cmd = /^[\x21-\x7e]$/.test(c) ? c : '-';
    const err = (reason: string): Body => ({ kind: 'R', ok: false, cmd, reason, fields: [] });
    if (text.length > MAX_COMMAND_CHARS) return err('too-long');
    if (c === '?') return text === '?' ? this.hello() : err('syntax');
    if (c === 'A') {
      const a = /^A ([0-9]+)$/.exec(text);
      if (!a) return err('syntax');
      const s = Number(a[1]);
      if (s > AIR_MAX_S) return err('range');
      this.undoReadingsAfter(t);
      // The next reading is taken at once (the firmware makes it due now).
      this.setAir(s, this.clock!.ticksAt(t));
      return { kind: 'R', ok: true, cmd, fields: [`s=${s}`] };
    }
    if (c !== 'P' && c !== 'C') return err('unknown');
    const m = (c === 'P' ? /^P ([0-9]+)$/ : /^C ([0-9a-fA-F]+)$/).exec(text);
    if (!m) return err('syntax');
    const v = parseInt(m[1]!, c === 'P' ? 10 : 16);
    if (c === 'P') {
      if (v < HEARTBEAT_MIN_MS || v > HEARTBEAT_MAX_MS) return err('range');
      this.undoLookahead(t, (b) => b.kind === 'T');
      // The firmware restarts its heartbeat grid as it handles the command, just before the reply.
      this.setHeartbeat(v, this.clock!.ticksAt(t + REPLY_LATENCY_S));
      return { kind: 'R', ok: true, cmd, fields: [`ms=${v}`] };
    }
    if (v >= 1 << this.cfg.channels) return err('range');
    this.undoLookahead(t, (b) => b.kind === 'E' && !(v & (1 << b.ch)));
    this.mask = v;
    return { kind: 'R', ok: true, cmd, fields: [`mask=${v.toString(16)}`] };
  }

  /**
   * Finding when its next line is due, the model may have run past a command's time: lines it formed for
   * events after t that the command changes (heartbeats after a new period, edges of a channel switched off)
   * never existed on the firmware. (Edges of a channel switched on within that look-ahead stay unreported.)
   */
  private undoLookahead(t: number, changed: (b: Body) => boolean): void {
    for (let i = this.pending.length - 1; i >= 0; i--) {
      const p = this.pending[i]!;
      if (p.line !== undefined || p.ev <= t || !changed(p.body!)) continue;
      this.pending.splice(i, 1);
      if (p.body!.kind === 'E') this.o.counts.edges_captured--;
    }
  }

  private hello(): Body {
    return {
      kind: 'H',
      proto: 1,
      fw: this.cfg.fw,
      mcu: this.cfg.mcu,
      hz: this.cfg.hz,
      ch: this.cfg.channels,
      boot: this.bootId,
      extra: { rc: this.rc.toString(16) },
    };
  }

  private seal(b: Body): string {
    const line = encodeRecord({ ...b, seq: this.seq } as DeviceRecord);
    this.seq = (this.seq + 1) % SEQ_MODULO;
    return line;
  }

  private queue(at: number, body: Body, ev = at): Pending {
    let i = this.pending.length;
    while (i > 0 && this.pending[i - 1]!.at > at) i--;
    const p: Pending = { at, ev, body, line: undefined };
    this.pending.splice(i, 0, p);
    return p;
  }

  private emitLatency(): number {
    const [a, b] = this.cfg.emit_latency_us;
    return this.rng.between(a, b) * 1e-6;
  }

  private pullEdge(): void {
    const r = this.edges.next();
    this.nextEdge = r.done ? undefined : r.value;
  }

  /** The next input event at or after the current state, and its time. */
  private nextInput(): [number, Input] {
    const s = this.o.schedule;
    let best: [number, Input] = [this.nextEdge ? this.nextEdge.t : Infinity, 'edge'];
    const consider = (t: number, k: Input) => {
      if (t < best[0]) best = [t, k];
    };
    if (this.up && this.stalledUntil === undefined) consider(this.nextHbAt, 'heartbeat');
    if (this.up && this.stalledUntil === undefined) consider(this.nextAirAt, 'air');
    if (this.window && this.window.missed > 0) consider(this.window.checkAt, 'check');
    if (!this.up) consider(this.readyAt, 'ready');
    if (this.ri < s.reboots.length) consider(s.reboots[this.ri]!.t, 'reboot');
    if (this.stalledUntil !== undefined) consider(this.stalledUntil, 'resume');
    else if (this.si < s.stalls.length) consider(s.stalls[this.si]!.start, 'stall');
    return best;
  }

  /** Processes inputs until the head line cannot be preceded or removed by any later input. */
  private settle(): void {
    for (;;) {
      const [t, kind] = this.nextInput();
      const head = this.pending.length ? this.pending[0]!.at : Infinity;
      if (head < t || t > this.o.tEnd) {
        if (head > this.o.tEnd) this.pending.length = 0;
        return;
      }
      this.process(t, kind);
    }
  }

  private advanceTo(tNow: number): void {
    for (;;) {
      const [t, kind] = this.nextInput();
      if (t > tNow) return;
      this.process(t, kind);
    }
  }

  private process(t: number, kind: Input): void {
    switch (kind) {
      case 'edge':
        this.onEdge(this.nextEdge!);
        this.pullEdge();
        return;
      case 'heartbeat':
        this.onHeartbeat(t);
        return;
      case 'air':
        this.onAir(t);
        return;
      case 'check':
        this.resolveWindow();
        return;
      case 'reboot':
        this.onReboot(t, this.o.schedule.reboots[this.ri]!.cause);
        this.ri++;
        return;
      case 'ready':
        this.onBoot(t);
        return;
      case 'stall': {
        const w = this.o.schedule.stalls[this.si++]!;
        this.onStall(w);
        return;
      }
      case 'resume':
        this.onResume(t);
        return;
    }
  }

  private inDrop(t: number): boolean {
    const d = this.o.schedule.drops;
    while (this.di < d.length && d[this.di]!.end <= t) this.di++;
    return this.di < d.length && d[this.di]!.start <= t;
  }

  private onEdge(e: PinEdge): void {
    const ch = e.ch ?? this.o.channel;
    if (ch !== this.o.channel) {
      this.onOtherEdge(e, ch);
      return;
    }
    const before = this.levels[ch] as 0 | 1;
    if (before === e.level) return;
    this.levels[ch] = e.level;
    if (!this.up) {
      this.o.counts.edges_missed_while_down++;
      return;
    }
    if (!(this.mask & (1 << ch))) return;
    const at = this.clock!.ticksAt(e.t);
    const w = this.window;
    // A micro-tick of slack: times that went seconds → ticks must not miss an exact threshold by rounding.
    const since = w ? at - w.at + 1e-6 : Infinity;
    // Missed: an edge before the flip, then the one after it (the flipped select awaits the other direction).
    // The edge after those two is captured, whether or not the handler has re-armed by then.
    if (w && since < this.cfg.pin_check_ticks && (w.missed === 1 || (w.missed === 0 && since < this.cfg.min_edge_gap_ticks))) {
      w.missed++;
      this.o.counts.edges_lost_too_close++;
      return;
    }
    this.resolveWindow();
    this.window = { at, checkAt: this.clock!.timeAt(at + this.cfg.pin_check_ticks), level: e.level, missed: 0 };
    if (this.inDrop(e.t)) {
      this.lost++;
      this.o.counts.edges_lost_by_device++;
      return;
    }
    const ticks = (Math.floor(at) + this.cfg.capture_latency_ticks) % TICKS_MAX;
    this.enqueueEdge(e.t, { kind: 'E', ch, edge: e.level ? 'r' : 'f', ticks });
  }

  /**
   * An edge of a second beam's channel. Channel 1's input waits longer than channel 0's (protocol/link-defaults.ts
   * CHANNEL_LATENCY_TICKS); its blind time is not modelled (two of its edges closer than ~10 µs need bounce).
   */
  private onOtherEdge(e: PinEdge, ch: number): void {
    if (this.levels[ch] === e.level) return;
    this.levels[ch] = e.level;
    if (!this.up) {
      this.o.counts.edges_missed_while_down++;
      return;
    }
    if (!(this.mask & (1 << ch))) return;
    if (this.inDrop(e.t)) {
      this.lost++;
      this.o.counts.edges_lost_by_device++;
      return;
    }
    const extra = ch === 1 ? CHANNEL_LATENCY_TICKS[1] - CHANNEL_LATENCY_TICKS[0] : 0;
    const ticks = (Math.floor(this.clock!.ticksAt(e.t)) + this.cfg.capture_latency_ticks + extra) % TICKS_MAX;
    this.enqueueEdge(e.t, { kind: 'E', ch, edge: e.level ? 'r' : 'f', ticks });
  }

  /** Queues a captured edge: held back during a stall (or lost once the buffer is full), else in capture order. */
  private enqueueEdge(t: number, body: Body): void {
    if (this.stalledUntil !== undefined) {
      if (this.stallQueued >= this.cfg.buffer_edges) {
        this.lost++;
        this.o.counts.edges_lost_by_device++;
        this.o.counts.edges_lost_in_stall++;
        return;
      }
      this.stallQueued++;
      this.o.counts.edges_captured++;
      this.queue(this.stalledUntil + ++this.stallOrder * 1e-6, body);
      return;
    }
    this.o.counts.edges_captured++;
    // Lines leave in capture order: the main loop drains the edge buffer first in, first out.
    const lastE = this.pending.length ? this.pending[this.pending.length - 1]!.at : -Infinity;
    this.queue(Math.max(t + this.emitLatency(), lastE), body, t);
  }

  /**
   * The firmware's checks after a capture with missed edges count every one: the pin sample right after
   * the edge-select flip shows the first, and the handler's check (a late capture, or the pin at re-arm)
   * the second.
   */
  private resolveWindow(): void {
    const w = this.window;
    this.window = undefined;
    if (!w || w.missed === 0) return;
    this.lost += w.missed;
    this.o.counts.edges_lost_by_device += w.missed;
  }

  private setHeartbeat(ms: number, fromTicks: number): void {
    this.hbTicksPer = (this.cfg.hz * ms) / 1000;
    this.nextHbTicks = fromTicks + this.hbTicksPer;
    this.nextHbAt = this.clock!.timeAt(this.nextHbTicks);
  }

  private onHeartbeat(t: number): void {
    const levels = this.levels.reduce((m, l, i) => m | (l << i), 0);
    // The firmware reads the counter at the deadline itself (its compare-match alarm), then formats the line.
    // The levels and the lost count are those at the deadline; the line follows after formatting.
    this.queue(Math.max(t + this.emitLatency(), this.lastQueued()), { kind: 'T', ticks: Math.floor(this.nextHbTicks) % TICKS_MAX, lost: this.lost, levels }, t);
    this.nextHbTicks += this.hbTicksPer;
    this.nextHbAt = this.clock!.timeAt(this.nextHbTicks);
  }

  private lastQueued(): number {
    return this.pending.length ? this.pending[this.pending.length - 1]!.at : -Infinity;
  }

  private onReboot(t: number, cause: string): void {
    // Lines already in the UART go out under the old boot's seq; the rest die with the reset.
    const keep: Pending[] = [];
    for (const p of this.pending) {
      if (p.at < t) keep.push({ ...p, line: p.line ?? this.seal(p.body!) });
      else this.o.counts.lines_cut_by_reboot++;
    }
    this.pending.length = 0;
    this.pending.push(...keep);
    this.o.counts.reboots++;
    // A blind window still open at the reset is never checked: its missed edges go uncounted.
    if (this.window) this.o.counts.edges_lost_silently += this.window.missed;
    this.window = undefined;
    this.up = false;
    this.stalledUntil = undefined;
    this.readyAt = t + this.cfg.boot_time_s;
    this.readyCause = cause;
  }

  private onBoot(t: number): void {
    this.up = true;
    this.seq = 0;
    this.lost = 0;
    this.window = undefined;
    this.rc = RESET_CAUSE[this.readyCause] ?? 1;
    this.mask = (1 << this.cfg.channels) - 1;
    this.bootId = this.rng.nextU32() & 0xffff;
    const phase = this.rng.uniform();
    this.clock = new DeviceClock(this.cfg.hz, this.cfg.ppm, this.cfg.drift_ppm_per_h, t, phase, this.o.room && clockExcursion(this.o.room));
    this.o.boots.push({ host_s: t, boot_id: this.bootId, phase_ticks: phase, cause: this.readyCause });
    const helloAt = Math.max(t + this.emitLatency(), this.lastQueued());
    this.queue(helloAt, this.hello());
    // The firmware schedules its first heartbeat one period after it has queued the hello.
    this.setHeartbeat(this.cfg.heartbeat_ms, this.clock.ticksAt(helloAt));
    this.airState = undefined;
    // The firmware probes the sensor right after the hello: with one fitted, the first reading (and its state)
    // follows a few ms later; with none, both addresses go unanswered at once and it says `absent`.
    this.setAir(this.o.room?.interval_s ?? AIR_DEFAULT_S, phase + 0.035 * this.cfg.hz);
    if (!this.o.room) this.noteSensor(SENSOR_FAULTS.absent, helloAt);
  }

  private onStall(w: Window): void {
    this.o.counts.stalls++;
    if (!this.up) return;
    this.stalledUntil = w.end;
    this.stallQueued = 0;
    this.stallOrder = 0;
    for (const p of this.pending) if (p.at >= w.start) p.at = w.end + ++this.stallOrder * 1e-6;
  }

  private onResume(t: number): void {
    this.stalledUntil = undefined;
    // Heartbeats that fell due in the stall are skipped; the next one keeps the tick grid.
    while (this.nextHbAt < t) {
      this.o.counts.heartbeats_skipped++;
      this.nextHbTicks += this.hbTicksPer;
      this.nextHbAt = this.clock!.timeAt(this.nextHbTicks);
    }
    while (this.nextAirAt < t) {
      this.nextAirTicks += this.airTicksPer;
      this.nextAirAt = this.clock!.timeAt(this.nextAirTicks);
    }
    this.stallQueued = 0;
  }
}
