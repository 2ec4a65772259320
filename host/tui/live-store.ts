// The view's store outside React: feeds entries to the pipeline and publishes throttled snapshots.
import type { JournalEntry } from '../../protocol/journal.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { parseRig, type Rig } from '../../protocol/rig.ts';

/** The part of the run pipeline the store drives. */
export interface PipelineLike<L, R> {
  push(entry: JournalEntry): void;
  live(): L;
  result(): R;
}

/** A published state: cheap live facts at up to `liveHz`, the full result at up to `resultHz`. */
export interface StoreSnapshot<L, R> {
  readonly live: L;
  readonly result: R;
  /** Host seconds of the newest data line or annotation (the run's own time base). */
  readonly lastHost_s: number | null;
  /** Host seconds of the first line seen since the last restart. */
  readonly firstHost_s: number | null;
  /** Wall-clock ms when the newest line arrived (for estimating "now" between lines). */
  readonly lastArrivalMs: number | null;
  readonly entries: number;
  /** Median host spacing of the recent heartbeat lines (seconds), null before two of them. */
  readonly heartbeatInterval_s: number | null;
  /** The rig from the journal's latest `#rig` line, when it is valid. */
  readonly rig: Rig | null;
  /** Increments on every publish. */
  readonly version: number;
}

export interface Timers {
  setInterval(fn: () => void, ms: number): unknown;
  clearInterval(handle: unknown): void;
}

export interface LiveStoreOptions<L, R> {
  readonly createPipeline: () => PipelineLike<L, R>;
  /** Wall clock in ms (injected: the store itself never reads the time). */
  readonly nowMs: () => number;
  readonly timers: Timers;
  readonly liveHz?: number;
  readonly resultHz?: number;
}

export interface LiveStore<L, R> {
  push(entry: JournalEntry): void;
  subscribe(listener: () => void): () => void;
  getSnapshot(): StoreSnapshot<L, R>;
  /** Starts a fresh pipeline from now on, replaying the header and the last hello so it knows the rig and clock. */
  restart(): void;
  /** Publishes at once with a fresh full result (at the end of a replay, so the screen equals `analyze`). */
  flush(): void;
  stop(): void;
}

/** Entries a restarted pipeline must see again: the journal header and the device's latest hello. */
function isContext(e: JournalEntry): boolean {
  return e.kind === 'magic' || e.kind === 'start' || e.kind === 'rig' || e.kind === 'source' || e.kind === 'header';
}
function isHello(line: string): boolean {
  if (!line.startsWith('H ')) return false;
  const d = decodeLine(line);
  return d.ok && d.record.kind === 'H';
}

/** Longest time between publishes while no line arrives. */
const IDLE_PUBLISH_MS = 1000;
/** Heartbeat arrivals kept for the spacing estimate. */
const BEATS_KEPT = 9;

/** Median of the spacings of increasing times (a lost or late heartbeat does not move it). */
export function medianSpacing(times: readonly number[]): number | null {
  if (times.length < 2) return null;
  const d = times.slice(1).map((t, i) => t - times[i]!).filter((x) => x > 0).sort((a, b) => a - b);
  return d.length ? d[Math.floor((d.length - 1) / 2)]! : null;
}

/** Creates a store; the publish timer runs until `stop()`. */
export function createLiveStore<L, R>(opts: LiveStoreOptions<L, R>): LiveStore<L, R> {
  const liveMs = 1000 / (opts.liveHz ?? 10);
  const resultMs = 1000 / (opts.resultHz ?? 2);
  let pipeline = opts.createPipeline();
  const context: JournalEntry[] = [];
  let lastHello: JournalEntry | null = null;
  let dirty = false;
  let resultStale = false;
  let lastResultMs = -Infinity;
  let entries = 0;
  let lastHost: number | null = null;
  let firstHost: number | null = null;
  let lastArrival: number | null = null;
  const beats: number[] = [];
  let rig: Rig | null = null;
  let result = pipeline.result();
  let snap: StoreSnapshot<L, R> = { live: pipeline.live(), result, lastHost_s: null, firstHost_s: null, lastArrivalMs: null, entries: 0, heartbeatInterval_s: null, rig: null, version: 0 };
  const listeners = new Set<() => void>();

  const publish = (forceResult: boolean): void => {
    const now = opts.nowMs();
    if (forceResult || (resultStale && now - lastResultMs >= resultMs)) {
      result = pipeline.result();
      resultStale = false;
      lastResultMs = now;
    }
    snap = { live: pipeline.live(), result, lastHost_s: lastHost, firstHost_s: firstHost, lastArrivalMs: lastArrival, entries, heartbeatInterval_s: medianSpacing(beats), rig, version: snap.version + 1 };
    dirty = false;
    for (const l of listeners) l();
  };

  // Publishing also when nothing arrived keeps time-based warnings (a stalled device) moving.
  let lastPublishMs = -Infinity;
  const timer = opts.timers.setInterval(() => {
    const now = opts.nowMs();
    if (dirty || resultStale || now - lastPublishMs >= IDLE_PUBLISH_MS) {
      lastPublishMs = now;
      publish(false);
    }
  }, liveMs);

  return {
    push(entry) {
      if (isContext(entry)) {
        // A resumed journal opens a new host time base: keep only the latest header block.
        if (entry.kind === 'magic') context.length = 0;
        else if (entry.kind === 'start') context.splice(0, context.length, ...context.filter((c) => c.kind === 'magic'));
        context.push(entry);
        if (entry.kind === 'rig') {
          const r = parseRig(entry.json);
          rig = r.ok ? r.rig : null;
        }
      } else if (entry.kind === 'data') {
        if (entry.line.startsWith('T ')) {
          beats.push(entry.hostUs / 1e6);
          if (beats.length > BEATS_KEPT) beats.shift();
        } else if (isHello(entry.line)) lastHello = entry;
      }
      pipeline.push(entry);
      entries++;
      if (entry.kind === 'data' || entry.kind === 'annotation') {
        lastHost = entry.hostUs / 1e6;
        firstHost ??= lastHost;
        lastArrival = opts.nowMs();
      }
      dirty = true;
      resultStale = true;
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    getSnapshot: () => snap,
    restart() {
      pipeline = opts.createPipeline();
      for (const e of context) pipeline.push(e);
      if (lastHello) pipeline.push(lastHello);
      firstHost = lastHost;
      publish(true);
    },
    flush: () => publish(true),
    stop() {
      opts.timers.clearInterval(timer);
      listeners.clear();
    },
  };
}
