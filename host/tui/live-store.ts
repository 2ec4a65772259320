// The view's store outside React: feeds entries to the pipeline and publishes throttled snapshots.
import type { JournalEntry } from '../../protocol/journal.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { parseSimpleRig, type Rig } from '../../protocol/rig.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { LiveState } from '../pipeline/live-state.ts';
import type { ResultSource } from '../pipeline/result-client.ts';
import { refreshGap, workerWithFallback } from '../pipeline/result-fallback.ts';
import { heartbeatCadence } from './heartbeat-cadence.ts';
import type { Timers as LinkTimers } from '../link/timers.ts';

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

/** The publish timer (tests move it by hand). */
export type Timers = Pick<LinkTimers, 'setInterval' | 'clearInterval'>;

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

/** What a restart replays to a fresh pipeline: the latest journal header block and the device's last hello. */
function restartReplay() {
  const header: JournalEntry[] = [];
  let lastHello: JournalEntry | null = null;
  return {
    note(entry: JournalEntry): void {
      if (isHeader(entry)) {
        // A resumed journal opens a new host time base: keep only the latest header block.
        if (entry.kind === 'magic') header.length = 0;
        else if (entry.kind === 'start') header.splice(0, header.length, ...header.filter((c) => c.kind === 'magic'));
        header.push(entry);
      } else if (entry.kind === 'data' && isHello(entry.line)) lastHello = entry;
    },
    entries: (): JournalEntry[] => (lastHello ? [...header, lastHello] : [...header]),
  };
}

/** The snapshot's facts about the run itself, beside the pipelines' state. */
type RunFacts = Omit<StoreSnapshot, 'live' | 'result' | 'version'>;

/** Times, entry count, heartbeat spacing and rig of the entries pushed, for the snapshot. */
function runFacts(nowMs: () => number) {
  let entries = 0;
  let lastHost: number | null = null;
  let firstHost: number | null = null;
  let restartedAt: number | null = null;
  let lastArrival: number | null = null;
  const beats = heartbeatCadence();
  let rig: Rig | null = null;
  return {
    note(entry: JournalEntry): void {
      if (entry.kind === 'rig') {
        const r = parseSimpleRig(entry.json);
        rig = r.ok ? r.rig : null;
      }
      beats.see(entry);
      entries++;
      if (entry.kind === 'data' || entry.kind === 'annotation') {
        lastHost = entry.hostUs / 1e6;
        firstHost ??= lastHost;
        lastArrival = nowMs();
      }
    },
    /** The estimates restart at the newest line. */
    restarted(): void {
      restartedAt = lastHost;
      firstHost = lastHost;
    },
    get: (): RunFacts => ({
      lastHost_s: lastHost,
      firstHost_s: firstHost,
      restartedAt_s: restartedAt,
      lastArrivalMs: lastArrival,
      entries,
      heartbeatInterval_s: beats.interval_s(),
      rig,
    }),
  };
}

/**
 * The full result shown: from the worker while it works, else computed in-thread from `pipeline()` (the estimates
 * since the last restart); recomputed no sooner than its cost allows (`refreshGap`). `publish` shows a fresh result.
 */
function resultRefresher(opts: LiveStoreOptions, pipeline: () => PipelineLike, publish: (force: boolean) => void) {
  const minGapMs = 1000 / (opts.resultHz ?? 2);
  const fallback = workerWithFallback(opts.createResults?.() ?? null, (line) => opts.warn?.(line));
  let result = pipeline().result();
  let stale = false;
  let lastMs = -Infinity;
  let gapMs = minGapMs;
  // Bumped on restart, so an answer about the entries before it is dropped.
  let generation = 0;
  let inFlight = false;
  let stopped = false;

  /** Asks the worker for the full result of everything pushed so far; resolves once it is shown. */
  const request = async (): Promise<void> => {
    const gen = generation;
    const t0 = opts.nowMs();
    stale = false;
    lastMs = t0;
    const fresh = await fallback.result({ rows: false });
    // The worker failed (warned once): in-thread from now on. Closed by stop(): nothing to show.
    if (fresh === undefined) {
      if (!stopped) publish(true);
      return;
    }
    if (gen !== generation || stopped) return;
    result = fresh;
    gapMs = refreshGap(minGapMs, opts.nowMs() - t0, true);
    publish(false);
  };

  return {
    current: (): AnalysisResult => result,
    stale: (): boolean => stale,
    push(entry: JournalEntry): void {
      fallback.push(entry);
      stale = true;
    },
    /** Starts a worker request, or recomputes in-thread, when forced or when the last result is stale and due. */
    refresh(force: boolean, now: number): void {
      const due = force || (stale && now - lastMs >= gapMs);
      if (fallback.worker) {
        if (due && !inFlight) {
          inFlight = true;
          void request().finally(() => (inFlight = false));
        }
      } else if (due) {
        result = pipeline().result({ rows: false });
        stale = false;
        lastMs = now;
        gapMs = refreshGap(minGapMs, opts.nowMs() - now, false);
      }
    },
    /** The worker starts over from `replay` (its answers about the entries before are dropped). */
    restart(replay: readonly JournalEntry[]): void {
      const w = fallback.worker;
      if (!w) return;
      generation++;
      inFlight = false;
      w.reset();
      for (const e of replay) w.push(e);
    },
    async flush(): Promise<void> {
      if (!fallback.worker) return publish(true);
      await request();
    },
    stop(): void {
      stopped = true;
      void fallback.close();
    },
  };
}

/** Creates a store; the publish timer runs until `stop()`. */
export function createLiveStore(opts: LiveStoreOptions): LiveStore {
  const whole = opts.createPipeline();
  let since: PipelineLike | null = null;
  const replay = restartReplay();
  const facts = runFacts(opts.nowMs);
  const results = resultRefresher(opts, () => since ?? whole, publish);
  const listeners = new Set<() => void>();
  let snap: StoreSnapshot = { live: whole.live(), result: results.current(), ...facts.get(), version: 0 };
  let dirty = false;
  let lastPublishMs = -Infinity;

  function publish(forceResult: boolean): void {
    const now = opts.nowMs();
    results.refresh(forceResult, now);
    const result = results.current();
    // The live amplitudes use the gate delay the shown result calibrated (it may come from the worker).
    const d = result.gate_delay?.difference_s ?? 0;
    const live = since ? mergeLive(whole.live(undefined, d), since.live(undefined, d)) : whole.live(undefined, d);
    snap = { live, result, ...facts.get(), version: snap.version + 1 };
    dirty = false;
    lastPublishMs = now;
    for (const l of listeners) l();
  }

  // Publishing also when nothing arrived keeps time-based warnings (a stalled device) moving.
  const timer = opts.timers.setInterval(() => {
    if (dirty || results.stale() || opts.nowMs() - lastPublishMs >= IDLE_PUBLISH_MS) publish(false);
  }, 1000 / (opts.liveHz ?? LIVE_HZ));

  return {
    push(entry) {
      replay.note(entry);
      whole.push(entry);
      since?.push(entry);
      results.push(entry);
      facts.note(entry);
      dirty = true;
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    getSnapshot: () => snap,
    restart() {
      since = opts.createPipeline();
      const again = replay.entries();
      for (const e of again) since.push(e);
      results.restart(again);
      facts.restarted();
      publish(true);
    },
    flush: () => results.flush(),
    stop() {
      opts.timers.clearInterval(timer);
      listeners.clear();
      results.stop();
    },
  };
}
