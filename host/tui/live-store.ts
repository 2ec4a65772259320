// The view's store outside React: feeds entries to the pipeline and publishes throttled snapshots.
import type { JournalEntry } from '../../protocol/journal.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { parseSimpleRig, type Rig } from '../../protocol/rig.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { LiveState } from '../pipeline/live-state.ts';
import type { ResultSource } from '../pipeline/result-client.ts';
import { workerWithFallback } from '../pipeline/result-fallback.ts';

/** The part of the run pipeline (`createRunPipeline`) the store drives. */
export interface PipelineLike {
  push(entry: JournalEntry): void;
  live(nowHostUs?: number, delayS?: number): LiveState;
  result(opts?: { rows?: boolean }): AnalysisResult;
}

/**
 * A published state: cheap live facts at up to `liveHz` (default LIVE_HZ), the full result at up to `resultHz`.
 * The result leaves out the swing rows (the view never reads them; copying them from the worker for a 10 h run
 * stalled the main thread for about half a second); every other field equals `analyze`.
 */
export interface StoreSnapshot {
  readonly live: LiveState;
  readonly result: AnalysisResult;
  /** Host seconds of the newest data line or annotation (the run's own time base). */
  readonly lastHost_s: number | null;
  /** Host seconds of the first line seen, or of the last restart of the estimates. */
  readonly firstHost_s: number | null;
  /** Host seconds at which the estimates were restarted (`r`), or null. */
  readonly restartedAt_s: number | null;
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

export interface LiveStoreOptions {
  readonly createPipeline: () => PipelineLike;
  /** Wall clock in ms (injected: the store itself never reads the time). */
  readonly nowMs: () => number;
  readonly timers: Timers;
  readonly liveHz?: number;
  readonly resultHz?: number;
  /**
   * Where the full result is computed off the main thread (a worker fed the same entries). Without it, or
   * once it fails, the store's own pipeline computes it in-thread.
   */
  readonly createResults?: () => ResultSource;
  /** One line for the user when the worker fails and the store falls back to in-thread results. */
  readonly warn?: (line: string) => void;
}

export interface LiveStore {
  push(entry: JournalEntry): void;
  subscribe(listener: () => void): () => void;
  getSnapshot(): StoreSnapshot;
  /**
   * Restarts the estimates from now: a second pipeline, given the journal header and the device's last
   * hello, sees only what comes next. Health counts keep coming from the whole run.
   */
  restart(): void;
  /** Publishes a fresh full result of everything pushed so far (at the end of a replay, so the screen equals `analyze`). */
  flush(): Promise<void>;
  /** Stops publishing and ends the result worker. */
  stop(): void;
}

/**
 * Snapshots per second. A frame of the full screen costs ink 20–40 ms (measured at 100×30 on this code), so
 * 5 Hz keeps the viewer near a tenth of a core and still looks live; keys re-render at once regardless.
 */
export const LIVE_HZ = 5;
/** Longest time between publishes while no line arrives. */
const IDLE_PUBLISH_MS = 1000;
/** The full result is recomputed no sooner than this many times its last cost. */
const RESULT_COST_FACTOR = 10;
/** In a worker the cost does not block the screen: keep the worker under about a quarter of a core. */
const WORKER_COST_FACTOR = 4;
/** Heartbeat arrivals kept for the spacing estimate. */
const BEATS_KEPT = 9;

/** Median of the spacings of increasing times (a lost or late heartbeat does not move it). */
export function medianSpacing(times: readonly number[]): number | null {
  if (times.length < 2) return null;
  const d = times
    .slice(1)
    .map((t, i) => t - times[i]!)
    .filter((x) => x > 0)
    .sort((a, b) => a - b);
  return d.length ? d[Math.floor((d.length - 1) / 2)]! : null;
}

/** Entries a restarted pipeline must see again: the journal header block. */
function isHeader(e: JournalEntry): boolean {
  return e.kind === 'magic' || e.kind === 'start' || e.kind === 'rig' || e.kind === 'source' || e.kind === 'header';
}

function isHello(line: string): boolean {
  if (!line.startsWith('H ')) return false;
  const d = decodeLine(line);
  return d.ok && d.record.kind === 'H';
}

/** The swing facts of the restarted estimates, with the device, room and health facts of the whole run. */
export function mergeLive(whole: LiveState, since: LiveState): LiveState {
  return {
    ...since,
    hello: whole.hello,
    bootIndex: whole.bootIndex,
    lastHostUs: whole.lastHostUs,
    heartbeatAgeS: whole.heartbeatAgeS,
    levels: whole.levels,
    blocked: whole.blocked,
    counts: whole.counts,
    room: whole.room,
  };
}

/** Creates a store; the publish timer runs until `stop()`. */
export function createLiveStore(opts: LiveStoreOptions): LiveStore {
  const liveMs = 1000 / (opts.liveHz ?? LIVE_HZ);
  const resultMs = 1000 / (opts.resultHz ?? 2);
  const whole = opts.createPipeline();
  let since: PipelineLike | null = null;
  const header: JournalEntry[] = [];
  let lastHello: JournalEntry | null = null;
  let dirty = false;
  let resultStale = false;
  let lastResultMs = -Infinity;
  let resultGapMs = resultMs;
  let lastPublishMs = -Infinity;
  let entries = 0;
  let lastHost: number | null = null;
  let firstHost: number | null = null;
  let restartedAt: number | null = null;
  let lastArrival: number | null = null;
  const beats: number[] = [];
  let rig: Rig | null = null;
  let result = whole.result();
  let snap: StoreSnapshot = {
    live: whole.live(),
    result,
    lastHost_s: null,
    firstHost_s: null,
    restartedAt_s: null,
    lastArrivalMs: null,
    entries: 0,
    heartbeatInterval_s: null,
    rig: null,
    version: 0,
  };
  const listeners = new Set<() => void>();
  const fallback = workerWithFallback(opts.createResults?.() ?? null, (line) => opts.warn?.(line));
  // Bumped on restart, so an answer about the entries before it is dropped.
  let generation = 0;
  let inFlight = false;
  let stopped = false;

  /** Asks the worker for the full result of everything pushed so far; resolves once it is shown. */
  const request = async (r: ResultSource): Promise<void> => {
    const gen = generation;
    const t0 = opts.nowMs();
    resultStale = false;
    lastResultMs = t0;
    const fresh = await r.result({ rows: false });
    if (gen !== generation || stopped) return;
    result = fresh;
    resultGapMs = Math.max(resultMs, WORKER_COST_FACTOR * (opts.nowMs() - t0));
    publish(false);
  };

  const publish = (forceResult: boolean): void => {
    const now = opts.nowMs();
    const results = fallback.worker;
    if (results) {
      if (!inFlight && (forceResult || (resultStale && now - lastResultMs >= resultGapMs))) {
        inFlight = true;
        const r = results;
        request(r).then(
          () => (inFlight = false),
          (e: unknown) => {
            inFlight = false;
            if (!stopped) {
              fallback.fail(e);
              publish(true);
            }
          },
        );
      }
    } else if (forceResult || (resultStale && now - lastResultMs >= resultGapMs)) {
      result = (since ?? whole).result({ rows: false });
      resultStale = false;
      lastResultMs = now;
      // The full analysis grows with the run: keep it under about a tenth of the time.
      resultGapMs = Math.max(resultMs, RESULT_COST_FACTOR * (opts.nowMs() - now));
    }
    // The live amplitudes use the gate delay the shown result calibrated (it may come from the worker).
    const d = result.gate_delay?.difference_s ?? 0;
    const live = since ? mergeLive(whole.live(undefined, d), since.live(undefined, d)) : whole.live(undefined, d);
    snap = {
      live,
      result,
      lastHost_s: lastHost,
      firstHost_s: firstHost,
      restartedAt_s: restartedAt,
      lastArrivalMs: lastArrival,
      entries,
      heartbeatInterval_s: medianSpacing(beats),
      rig,
      version: snap.version + 1,
    };
    dirty = false;
    lastPublishMs = now;
    for (const l of listeners) l();
  };

  // Publishing also when nothing arrived keeps time-based warnings (a stalled device) moving.
  const timer = opts.timers.setInterval(() => {
    if (dirty || resultStale || opts.nowMs() - lastPublishMs >= IDLE_PUBLISH_MS) publish(false);
  }, liveMs);

  return {
    push(entry) {
      if (isHeader(entry)) {
        // A resumed journal opens a new host time base: keep only the latest header block.
        if (entry.kind === 'magic') header.length = 0;
        else if (entry.kind === 'start') header.splice(0, header.length, ...header.filter((c) => c.kind === 'magic'));
        header.push(entry);
        if (entry.kind === 'rig') {
          const r = parseSimpleRig(entry.json);
          rig = r.ok ? r.rig : null;
        }
      } else if (entry.kind === 'data') {
        if (entry.line.startsWith('T ')) {
          beats.push(entry.hostUs / 1e6);
          if (beats.length > BEATS_KEPT) beats.shift();
        } else if (isHello(entry.line)) lastHello = entry;
      }
      whole.push(entry);
      since?.push(entry);
      fallback.push(entry);
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
      since = opts.createPipeline();
      const again = lastHello ? [...header, lastHello] : [...header];
      for (const e of again) since.push(e);
      const results = fallback.worker;
      if (results) {
        generation++;
        inFlight = false;
        results.reset();
        for (const e of again) results.push(e);
      }
      restartedAt = lastHost;
      firstHost = lastHost;
      publish(true);
    },
    async flush() {
      const r = fallback.worker;
      if (!r) return publish(true);
      try {
        await request(r);
      } catch (e) {
        if (stopped) return;
        fallback.fail(e);
        publish(true);
      }
    },
    stop() {
      stopped = true;
      opts.timers.clearInterval(timer);
      listeners.clear();
      void fallback.close();
    },
  };
}
