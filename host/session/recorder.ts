// The recording loop: link events → journal (and the pipeline), status snapshots, one shutdown path.
import type { JournalEntry } from '../../protocol/journal.ts';
import type { DeviceLink } from '../link/device-link.ts';
import type { MicrosClock } from '../link/monotonic-clock.ts';
import type { RunPipeline } from '../pipeline/run-pipeline.ts';
import { createResultSource, type ResultSource } from '../pipeline/result-client.ts';
import { refreshGap, workerWithFallback, type WorkerWithFallback } from '../pipeline/result-fallback.ts';
import { systemTimers, type Timers } from '../link/timers.ts';
import type { BlockHeader, JournalWriter } from '../journal/journal-writer.ts';
import { startRecording } from './recording-session.ts';
import { buildStatus, type RecorderStatus } from './recorder-status.ts';

export interface RecorderOptions {
  readonly link: DeviceLink;
  readonly writer: JournalWriter;
  readonly header: BlockHeader;
  /** Fed every entry written, for the status numbers (passes, period, amplitude, g). */
  readonly pipeline?: RunPipeline;
  /**
   * Where g is computed: by default a worker thread fed the same entries (the full analysis takes up to about
   * a second on a long run, which would delay the link's receive timestamps); its pipeline takes the rig from
   * the block's `#rig` line. Falls back to `pipeline.result()` in-thread when the worker fails.
   */
  readonly createResults?: () => ResultSource;
  /** One line for the user (the worker fell back to in-thread); default stderr. */
  readonly warn?: (line: string) => void;
  /** The link's clock (µs since the block's `#start`); also times the analysis, to pace it. */
  readonly now: MicrosClock;
  /** The status timer; this process's by default (tests drive it by hand). */
  readonly timers?: Pick<Timers, 'setInterval' | 'clearInterval'>;
  readonly wallNow?: () => Date;
  readonly statusEveryMs: number;
  readonly onStatus?: (s: RecorderStatus) => void;
  /** Aborting it is the one way to stop: the link closes, the last lines are written, the journal synced. */
  readonly signal: AbortSignal;
  /** Called with the abort reason's text for the `disconnect` annotation. */
  readonly stopReason?: () => string;
  /** Lines per second above which the device counts as flooding (a pendulum sends about 5). */
  readonly floodLinesPerS?: number;
  /** Extra warnings to show in every status (sleep inhibitor missing, USB autosuspend). */
  readonly warnings?: () => readonly string[];
  readonly pid?: number;
}

export interface RecorderSummary {
  readonly status: RecorderStatus;
  /** Set when recording stopped because the journal could not be written (disk full). */
  readonly error?: Error;
}

/** g of the latest full result, and its gate delay difference (s) for the live amplitudes. */
type G = { readonly value: number | null; readonly u: number | null; readonly delayS: number };

/** g of every entry fed so far, recomputed no more often than it stays cheap; from the worker when there is one. */
function gRefresher(o: RecorderOptions, results: WorkerWithFallback) {
  let g: G = { value: null, u: null, delayS: 0 };
  let dueUs = 0;
  let inFlight: Promise<void> | null = null;
  const refresh = async (t: number): Promise<void> => {
    if (!o.pipeline) return;
    const t0 = o.now();
    const fromWorker = await results.result({ rows: false });
    const r = fromWorker ?? o.pipeline.result({ rows: false });
    g = { value: r.g_m_s2, u: r.g_u_m_s2, delayS: r.gate_delay?.difference_s ?? 0 };
    dueUs = t + refreshGap(o.statusEveryMs * 1000, o.now() - t0, fromWorker !== undefined);
  };
  return {
    g: (): G => g,
    /** Starts a fresh g when one is due (it lands in a later status). */
    maybeStart(t: number): void {
      if (o.pipeline && t >= dueUs && !inFlight) inFlight = refresh(t).finally(() => (inFlight = null));
    },
    /** Waits for the one in flight, then computes g of everything written. */
    async final(): Promise<void> {
      await inFlight;
      await refresh(o.now());
    },
  };
}

/** Lines per second over the last half second or more, and whether that is a flood (noted once per flood). */
function floodWatch(o: RecorderOptions) {
  const flood = o.floodLinesPerS ?? 500;
  let rate = { atUs: o.now(), lines: 0, perS: 0 };
  let flooding = false;
  return (t: number, lines: number, note: (text: string) => void): { perS: number; warning?: string } => {
    const dt = (t - rate.atUs) / 1e6;
    if (dt >= 0.5) rate = { atUs: t, lines, perS: (lines - rate.lines) / dt };
    if (rate.perS <= flood) {
      flooding = false;
      return { perS: rate.perS };
    }
    if (!flooding) note(`device flooding: ${Math.round(rate.perS)} lines/s`);
    flooding = true;
    return { perS: rate.perS, warning: `device is flooding: ${Math.round(rate.perS)} lines/s (check the gate for noise or bounce)` };
  };
}

/** Resolves when the link has closed, after the signal aborted it (or it gave up by itself). */
async function untilClosed(o: RecorderOptions, closed: Promise<void>, onStatus: () => void): Promise<void> {
  const timers = o.timers ?? systemTimers;
  const tick = timers.setInterval(onStatus, o.statusEveryMs);
  const stop = (): void => void o.link.close(o.stopReason?.() ?? 'shutdown');
  if (o.signal.aborted) stop();
  else o.signal.addEventListener('abort', stop, { once: true });
  try {
    await closed;
  } finally {
    timers.clearInterval(tick);
    o.signal.removeEventListener('abort', stop);
  }
}

/**
 * Runs until the signal aborts or the journal fails. Nothing is written before the board's first hello:
 * if it never comes, the link's `ready` error is thrown and the journal is left as it was.
 */
export async function runRecorder(o: RecorderOptions): Promise<RecorderSummary> {
  const wallNow = o.wallNow ?? (() => new Date());
  const warn = o.warn ?? ((line: string) => void process.stderr.write(`halfswing: ${line}\n`));
  let state: RecorderStatus['state'] = 'waiting-hello';
  let error: Error | undefined;
  const results = workerWithFallback(o.pipeline ? (o.createResults?.() ?? createResultSource({}, warn)) : null, warn);
  const g = gRefresher(o, results);
  const rate = floodWatch(o);

  let closed!: () => void;
  const linkClosed = new Promise<void>((r) => (closed = r));
  const session = startRecording({
    link: o.link,
    writer: o.writer,
    header: o.header,
    onEntry: (e: JournalEntry) => {
      o.pipeline?.push(e);
      results.push(e);
    },
    onState: (e) => {
      if (e.state === 'connected') state = 'connected';
      else if (e.state === 'reconnecting') state = 'reconnecting';
      else if (e.state === 'waiting-hello' && session.started()) state = 'reconnecting';
      else if (e.state === 'closed') closed();
    },
    onWriteError: (e) => {
      error ??= e;
      void o.link.close('journal write failed');
    },
  });

  const snapshot = (): RecorderStatus => {
    const t = o.now();
    const stats = o.link.stats();
    const flood = rate(t, stats.lines, (text) => session.started() && !error && session.note(t, text));
    if (session.started() && state !== 'stopped') g.maybeStart(t);
    return buildStatus({
      wall: wallNow(),
      pid: o.pid ?? process.pid,
      state,
      port: o.link.path(),
      journal: o.writer.path,
      journalBytes: o.writer.size(),
      hostUs: t,
      linesPerS: flood.perS,
      link: stats,
      live: o.pipeline?.live(t, g.g().delayS),
      g: g.g(),
      warnings: [...(o.warnings?.() ?? []), ...(flood.warning ? [flood.warning] : [])],
    });
  };

  await untilClosed(o, linkClosed, () => o.onStatus?.(snapshot()));
  if (!session.started() && !error) {
    await results.close();
    // Throws the reason the board never answered; nothing was written.
    await o.link.ready;
  }
  try {
    o.writer.sync();
  } catch (e) {
    error ??= e as Error;
  }
  state = 'stopped';
  // The last status carries g of every line written.
  if (session.started()) await g.final();
  await results.close();
  const status = snapshot();
  o.onStatus?.(status);
  return error ? { status, error } : { status };
}
