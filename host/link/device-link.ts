// The device link: owns a serial port, frames and timestamps lines, waits for the hello, and survives unplugs and reboots.
import type { BindingInterface } from './binding-types.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { connectBaudField, type AnnotationWord } from '../../protocol/journal.ts';
import { PROTOCOL_VERSION, type HelloRecord } from '../../protocol/records.ts';
import { UserError } from '../errors.ts';
import { DEFAULT_BAUD, HEARTBEAT_DEFAULT_MS } from '../../protocol/link-defaults.ts';
import { LineFramer } from './line-framer.ts';
import { monotonicClock, type MicrosClock } from './monotonic-clock.ts';
import { openErrorMessage } from './open-errors.ts';
import { findByIdentity, identityOf, listPorts, pickAutoPort, type PortIdentity } from './port-list.ts';
import { openSession, type SerialSession } from './serial-session.ts';
import { systemTimers, type Timers } from './timers.ts';

/** What the link is doing. */
export type LinkState =
  | { readonly state: 'opening'; readonly path: string }
  | { readonly state: 'waiting-hello'; readonly path: string }
  | { readonly state: 'connected'; readonly path: string; readonly hello: HelloRecord; readonly reconnects: number }
  | { readonly state: 'reconnecting'; readonly attempt: number; readonly delayMs: number; readonly reason: string }
  | { readonly state: 'closed' };

/** Everything the link reports, in order. `hostUs` is the link clock (µs since the journal block's start). */
export type LinkEvent =
  /** A framed device line exactly as received (CR stripped), stamped when its LF arrived. */
  | { readonly type: 'line'; readonly hostUs: number; readonly line: string }
  /** Something the journal should record: `connect`, `disconnect`, `error`, `note`. */
  | { readonly type: 'annotation'; readonly hostUs: number; readonly word: AnnotationWord; readonly text: string }
  | ({ readonly type: 'state'; readonly hostUs: number } & LinkState);

/** Counters since the link opened. */
export interface LinkStats {
  readonly bytes: number;
  readonly lines: number;
  /** Lines that decoded as protocol v1 records. */
  readonly validLines: number;
  /** Lines the decoder rejected (over-long ones included: their head is passed on and rejected). */
  readonly lineErrors: number;
  readonly overLong: number;
  readonly tailsDiscarded: number;
  readonly reconnects: number;
  /** Heartbeat period the link expects, ms (1000 until a `P` reply says otherwise). */
  readonly heartbeatMs: number;
}

export interface DeviceLinkOptions {
  /** A port path, or 'auto' to pick the one likely board. */
  readonly port: string;
  readonly baud?: number;
  /** The serial binding; the platform's (bindings-cpp) when omitted. Tests pass a mock. */
  readonly binding?: BindingInterface;
  /** µs since the journal block's `#start`; monotonic. Defaults to a monotonic clock started now. */
  readonly now?: MicrosClock;
  /** Timers for the hello wait, the nudges, the heartbeat watch and the reconnect backoff (tests drive them by hand). */
  readonly timers?: Pick<Timers, 'setTimeout' | 'clearTimeout'>;
  /** Give up waiting for the first hello after this long (ms). */
  readonly helloTimeoutMs?: number;
  /** Send `?` if no hello came this long after opening (ms; default the lesser of 1.5 s and a quarter of the timeout): the open may not have reset the board. */
  readonly helloNudgeMs?: number;
  /** Expected heartbeat period (ms); loss is declared after 3 periods without a heartbeat. */
  readonly heartbeatMs?: number;
  /** Reconnect backoff: first delay, doubling up to the max (ms). */
  readonly backoffMs?: { readonly first: number; readonly max: number };
  /** See SessionOptions.hupcl. */
  readonly hupcl?: boolean;
  /** Where to scan for ports when udevadm is missing (tests). */
  readonly sysRoot?: string;
  /** Events held for a slow async-iterator consumer before the port is paused (the OS buffers the rest). */
  readonly highWater?: number;
}

/** A running link. Iterate it (one consumer) or subscribe with `onEvent`; both see every event. */
export interface DeviceLink extends AsyncIterable<LinkEvent> {
  /** Resolves at the first hello; rejects with a UserError saying what is wrong when none comes. */
  readonly ready: Promise<HelloRecord>;
  onEvent(fn: (e: LinkEvent) => void): void;
  /** Sends one host command line (LF added); resolves when the OS took it. */
  send(command: string): Promise<void>;
  stats(): LinkStats;
  /** The port path in use (it may change across reconnects). */
  path(): string | undefined;
  /** The latest hello received (the board's firmware, clock, channels, boot id). */
  hello(): HelloRecord | undefined;
  /**
   * Stops intake, passes on a last line whose LF was lost if it decodes, closes the port and, if connected,
   * reports a `stop` with `reason` (default 'shutdown'). Idempotent.
   */
  close(reason?: string): Promise<void>;
}

const HEARTBEAT_LOSS_PERIODS = 3;

/** Loads the platform binding lazily, so tests and journal-only commands never touch the native addon. */
async function platformBinding(): Promise<BindingInterface> {
  const { SerialPort } = await import('serialport');
  return SerialPort.binding as unknown as BindingInterface;
}

/** Opens a device link. Never throws synchronously; failures of the first connection reject `ready`. */
export function openDeviceLink(opts: DeviceLinkOptions): DeviceLink {
  return new Link(opts);
}

class Link implements DeviceLink {
  readonly ready: Promise<HelloRecord>;
  private resolveReady!: (h: HelloRecord) => void;
  private rejectReady!: (e: Error) => void;
  private readonly now: MicrosClock;
  private readonly baud: number;
  private readonly helloTimeoutMs: number;
  private readonly helloNudgeMs: number;
  private readonly backoff: { first: number; max: number };
  private readonly highWater: number;
  private heartbeatMs: number;
  private binding: BindingInterface | undefined;
  private session: SerialSession | undefined;
  /** One framer for the link's life: each dropped session flushes it, so no partial line crosses sessions. */
  private readonly framer = new LineFramer();
  private currentPath: string | undefined;
  private identity: PortIdentity | undefined;
  private everConnected = false;
  private closed = false;
  private connected = false;
  private lastHello: HelloRecord | undefined;
  private lastBeatUs = 0;
  private readonly clock: Pick<Timers, 'setTimeout' | 'clearTimeout'>;
  private timers = new Set<unknown>();
  private listeners: ((e: LinkEvent) => void)[] = [];
  /** Events not yet taken by the iterator: `queue[head..]` (a head index, so taking one is O(1)). */
  private queue: LinkEvent[] = [];
  private head = 0;
  private wake: (() => void) | undefined;
  private paused = false;
  private iterating = false;
  private counts = { bytes: 0, lines: 0, validLines: 0, badLines: 0, reconnects: 0 };
  private waitStats = { bytes: 0, lines: 0, valid: 0, printable: 0, first: '' };
  private attempt = 0;

  constructor(private readonly opts: DeviceLinkOptions) {
    this.now = opts.now ?? monotonicClock();
    this.clock = opts.timers ?? systemTimers;
    this.baud = opts.baud ?? DEFAULT_BAUD;
    this.helloTimeoutMs = opts.helloTimeoutMs ?? 5000;
    this.helloNudgeMs = opts.helloNudgeMs ?? Math.min(1500, this.helloTimeoutMs / 4);
    this.heartbeatMs = opts.heartbeatMs ?? HEARTBEAT_DEFAULT_MS;
    this.backoff = { first: opts.backoffMs?.first ?? 250, max: opts.backoffMs?.max ?? 10_000 };
    this.highWater = opts.highWater ?? 20_000;
    this.ready = new Promise<HelloRecord>((res, rej) => {
      this.resolveReady = res;
      this.rejectReady = rej;
    });
    // `ready` may be ignored by a consumer that only iterates; never leave its rejection unhandled.
    this.ready.catch(() => {});
    void this.connect();
  }

  onEvent(fn: (e: LinkEvent) => void): void {
    this.listeners.push(fn);
  }

  async send(command: string): Promise<void> {
    if (!this.session) throw new Error('not connected');
    await this.session.write(`${command}\n`);
  }

  stats(): LinkStats {
    const f = this.framer.counts();
    return {
      bytes: this.counts.bytes,
      lines: this.counts.lines,
      validLines: this.counts.validLines,
      lineErrors: this.counts.badLines,
      overLong: f.overLong,
      tailsDiscarded: f.tailsDiscarded,
      reconnects: this.counts.reconnects,
      heartbeatMs: this.heartbeatMs,
    };
  }

  path(): string | undefined {
    return this.currentPath;
  }

  hello(): HelloRecord | undefined {
    return this.lastHello;
  }

  async close(reason = 'shutdown'): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    this.clearTimers();
    const s = this.session;
    this.session = undefined;
    if (s) {
      await s.close();
      this.framer.flush((line) => this.onLine(line, this.now()));
    }
    // A stop the host asked for is not a lost link: it gets its own word, so it is not counted as a disconnect.
    if (this.connected) this.annotate('stop', reason);
    this.connected = false;
    if (!this.everConnected) this.rejectReady(new UserError('link closed before the board said hello'));
    this.emit({ type: 'state', hostUs: this.now(), state: 'closed' });
    this.wake?.();
  }

  async *[Symbol.asyncIterator](): AsyncIterator<LinkEvent> {
    if (this.iterating) throw new Error('a DeviceLink has one iterator');
    this.iterating = true;
    for (;;) {
      while (this.head < this.queue.length) {
        const e = this.queue[this.head++]!;
        if (this.head >= 1024 && this.head * 2 >= this.queue.length) {
          this.queue = this.queue.slice(this.head);
          this.head = 0;
        }
        if (this.paused && this.backlog() < this.highWater / 2) {
          this.paused = false;
          this.session?.resume();
        }
        yield e;
      }
      if (this.closed) return;
      await new Promise<void>((r) => (this.wake = r));
      this.wake = undefined;
    }
  }

  private emit(e: LinkEvent): void {
    for (const fn of this.listeners) fn(e);
    if (!this.iterating && this.listeners.length > 0) return;
    this.queue.push(e);
    if (!this.paused && this.backlog() >= this.highWater) {
      // A slow consumer: stop reading; the OS buffer (and the tty's flow) holds the rest.
      this.paused = true;
      this.session?.pause();
    }
    const w = this.wake;
    this.wake = undefined;
    w?.();
  }

  private backlog(): number {
    return this.queue.length - this.head;
  }

  private annotate(word: AnnotationWord, text: string): void {
    this.emit({ type: 'annotation', hostUs: this.now(), word, text });
  }

  private timer(ms: number, fn: () => void): void {
    const t = this.clock.setTimeout(() => {
      this.timers.delete(t);
      fn();
    }, ms);
    this.timers.add(t);
  }

  private clearTimers(): void {
    for (const t of this.timers) this.clock.clearTimeout(t);
    this.timers.clear();
  }

  /** Resolves which path to open on this attempt; throws UserError (first attempt) when none can be chosen. */
  private async resolvePath(): Promise<string> {
    const binding = this.binding!;
    const list = (): Promise<Awaited<ReturnType<typeof listPorts>>> =>
      listPorts({ list: () => binding.list(), ...(this.opts.sysRoot ? { sysRoot: this.opts.sysRoot } : {}) });
    if (this.identity) {
      const found = findByIdentity((await list()).ports, this.identity);
      if (found) return found.path;
      // With 'auto', never fall back to whatever other board is attached now: wait for this one.
      if (this.opts.port === 'auto') throw new UserError(`the board (${describeIdentity(this.identity)}) is not attached`);
    }
    if (this.opts.port !== 'auto') return this.currentPath ?? this.opts.port;
    if (this.currentPath && !this.identity) return this.currentPath;
    const pick = pickAutoPort((await list()).ports);
    if (!pick.ok) throw new UserError(`--port auto: ${pick.why}`);
    return pick.port.path;
  }

  private async connect(): Promise<void> {
    if (this.closed) return;
    try {
      this.binding ??= this.opts.binding ?? (await platformBinding());
    } catch (e) {
      this.fail(new UserError(`serial support is not available on this system (${(e as Error).message})`));
      return;
    }
    let path: string;
    try {
      path = await this.resolvePath();
    } catch (e) {
      if (!this.everConnected) return this.fail(e as Error);
      return this.retry(`no port: ${(e as Error).message}`);
    }
    this.emit({ type: 'state', hostUs: this.now(), state: 'opening', path });
    let session: SerialSession;
    try {
      session = await openSession({ path, baud: this.baud, binding: this.binding, ...(this.opts.hupcl !== undefined ? { hupcl: this.opts.hupcl } : {}) });
    } catch (e) {
      if (!this.everConnected) return this.fail(new UserError(openErrorMessage(path, e)));
      return this.retry(openErrorMessage(path, e));
    }
    if (this.closed) {
      await session.close();
      return;
    }
    this.session = session;
    this.currentPath = path;
    this.connected = false;
    this.waitStats = { bytes: 0, lines: 0, valid: 0, printable: 0, first: '' };
    session.onData((chunk) => this.onChunk(chunk));
    session.onLost((reason) => void this.lost(reason));
    if (this.paused) session.pause();
    this.emit({ type: 'state', hostUs: this.now(), state: 'waiting-hello', path });
    this.nudgeLater(this.helloNudgeMs);
    this.timer(this.helloTimeoutMs, () => this.helloTimedOut(path));
  }

  private nudgeLater(ms: number): void {
    this.timer(ms, () => {
      if (this.connected || this.closed || !this.session) return;
      this.session.write('?\n').catch(() => {});
      this.nudgeLater(Math.max(250, ms));
    });
  }

  private async wrongProtocol(proto: number): Promise<void> {
    if (!this.session) return;
    const why = `the board's firmware speaks protocol ${proto}; this halfswing reads protocol ${PROTOCOL_VERSION}: update halfswing (or flash the firmware that ships with it)`;
    await this.dropSession();
    if (!this.everConnected) return this.fail(new UserError(why));
    this.annotate('error', why);
    this.retry(why);
  }

  private helloTimedOut(path: string): void {
    if (this.connected || this.closed) return;
    const why = this.silenceReason(path);
    if (!this.everConnected) {
      void this.dropSession().then(() => this.fail(new UserError(why)));
      return;
    }
    void this.dropSession().then(() => this.retry(why));
  }

  /** What the bytes seen while waiting for the hello say about the far end. */
  private silenceReason(path: string): string {
    const w = this.waitStats;
    const s = (this.helloTimeoutMs / 1000).toFixed(1);
    if (w.bytes === 0)
      return `no data from ${path} in ${s} s: wrong port, board not running halfswing firmware, or stuck in its bootloader (try 'halfswing ports')`;
    if (w.valid > 0) return `${path} sends protocol lines but no hello, even after '?': update the firmware or check the board`;
    if (w.printable === 0 || w.lines === 0)
      return `${path} sends ${w.bytes} bytes that are not text lines at ${this.baud} baud: probably the wrong baud (the firmware uses ${DEFAULT_BAUD}; see --baud)`;
    return `${path} speaks something else: ${w.lines} lines in ${s} s, none of them halfswing protocol (first: ${JSON.stringify(w.first.slice(0, 40))}); wrong baud or other firmware`;
  }

  private onChunk(chunk: Buffer): void {
    if (this.closed) return;
    const t = this.now();
    this.counts.bytes += chunk.length;
    this.waitStats.bytes += chunk.length;
    this.framer.push(chunk, (line) => this.onLine(line, t));
  }

  private onLine(line: string, hostUs: number): void {
    this.counts.lines++;
    this.waitStats.lines++;
    if (/^[\x20-\x7e]+$/.test(line)) {
      this.waitStats.printable++;
      if (!this.waitStats.first) this.waitStats.first = line;
    }
    const d = decodeLine(line);
    if (d.ok && d.record.kind === 'H' && !this.connected) {
      // SPEC section 6: a hello of another protocol version must not be read as version 1.
      if (d.record.proto !== PROTOCOL_VERSION) {
        this.emit({ type: 'line', hostUs, line });
        this.counts.validLines++;
        void this.wrongProtocol(d.record.proto);
        return;
      }
      // The hello that completes a connection is preceded by its `connect` annotation (JOURNAL.md order).
      this.onHello(d.record, hostUs);
    }
    this.emit({ type: 'line', hostUs, line });
    if (!d.ok) {
      this.counts.badLines++;
      return;
    }
    this.counts.validLines++;
    this.waitStats.valid++;
    const r = d.record;
    if (r.kind === 'T') this.lastBeatUs = hostUs;
    if (r.kind === 'R' && r.ok && r.cmd === 'P') {
      const ms = Number(/^ms=(\d+)$/.exec(r.fields[0] ?? '')?.[1]);
      if (ms > 0) this.heartbeatMs = ms;
    }
    if (r.kind === 'H') {
      this.lastHello = r;
      this.lastBeatUs = hostUs;
    }
  }

  private onHello(h: HelloRecord, hostUs: number): void {
    this.lastHello = h;
    this.lastBeatUs = hostUs;
    this.connected = true;
    this.clearTimers();
    const reconnect = this.everConnected;
    if (reconnect) this.counts.reconnects++;
    this.emit({ type: 'annotation', hostUs, word: 'connect', text: `${this.currentPath} fw=${h.fw} boot=${h.boot.toString(16).padStart(4, '0')} ${connectBaudField(this.baud)}` });
    this.attempt = 0;
    this.emit({ type: 'state', hostUs, state: 'connected', path: this.currentPath!, hello: h, reconnects: this.counts.reconnects });
    if (!reconnect) {
      this.everConnected = true;
      void this.learnIdentity();
      this.resolveReady(h);
    }
    this.watchHeartbeat();
  }

  /** Remembers the port's USB identity, so a replug that renames the port is followed. */
  private async learnIdentity(): Promise<void> {
    try {
      const { ports } = await listPorts({ list: () => this.binding!.list(), ...(this.opts.sysRoot ? { sysRoot: this.opts.sysRoot } : {}) });
      const me = ports.find((p) => p.path === this.currentPath || p.byId === this.currentPath);
      if (me) this.identity = identityOf(me);
    } catch {
      // Without an identity the same path is reopened.
    }
  }

  private watchHeartbeat(): void {
    const check = (): void => {
      if (!this.connected || this.closed) return;
      const silentMs = (this.now() - this.lastBeatUs) / 1000;
      if (silentMs > HEARTBEAT_LOSS_PERIODS * this.heartbeatMs) {
        void this.lost(`no heartbeat for ${(silentMs / 1000).toFixed(1)} s`);
        return;
      }
      this.timer(Math.max(20, this.heartbeatMs / 2), check);
    };
    this.timer(Math.max(20, this.heartbeatMs / 2), check);
  }

  private async dropSession(): Promise<void> {
    this.clearTimers();
    const s = this.session;
    this.session = undefined;
    if (s) {
      await s.close().catch(() => {});
      this.framer.flush((line) => this.onLine(line, this.now()));
    }
  }

  private async lost(reason: string): Promise<void> {
    if (this.closed || !this.session) return;
    const wasConnected = this.connected;
    this.connected = false;
    await this.dropSession();
    if (!this.everConnected) {
      this.fail(new UserError(`${this.currentPath}: ${reason} before the board said hello`));
      return;
    }
    if (wasConnected) this.annotate('disconnect', reason);
    this.retry(reason);
  }

  private retry(reason: string): void {
    if (this.closed) return;
    this.attempt++;
    const delayMs = Math.min(this.backoff.max, this.backoff.first * 2 ** Math.min(this.attempt - 1, 20));
    this.emit({ type: 'state', hostUs: this.now(), state: 'reconnecting', attempt: this.attempt, delayMs, reason });
    this.timer(delayMs, () => void this.connect());
  }

  private fail(e: Error): void {
    this.rejectReady(e);
    void this.close();
  }
}

function describeIdentity(id: PortIdentity): string {
  if (id.serialNumber) return `serial number ${id.serialNumber}`;
  if (id.byId) return id.byId;
  return `${id.vendorId ?? '?'}:${id.productId ?? '?'}`;
}
