// The recording loop: link events → journal (and the pipeline), status snapshots, one shutdown path.
import type { JournalEntry } from '../../protocol/journal.ts';
import type { DeviceLink } from '../link/device-link.ts';
import type { MicrosClock } from '../link/monotonic-clock.ts';
import type { RunPipeline } from '../pipeline/run-pipeline.ts';
import { createResultSource, type ResultSource } from '../pipeline/result-client.ts';
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
  /** The link's clock (µs since the block's `#start`). */
  readonly now: MicrosClock;
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

/**
 * Runs until the signal aborts or the journal fails. Nothing is written before the board's first hello:
 * if it never comes, the link's `ready` error is thrown and the journal is left as it was.
 */
export async function runRecorder(o: RecorderOptions): Promise<RecorderSummary> {
  const wallNow = o.wallNow ?? (() => new Date());
  const flood = o.floodLinesPerS ?? 500;
  let state: RecorderStatus['state'] = 'waiting-hello';
  let error: Error | undefined;
  let g: { value: number | null; u: number | null } = { value: null, u: null };
  let gDueUs = 0;
  let rate = { atUs: o.now(), lines: 0, perS: 0 };
  let flooding = false;
  const warn = o.warn ?? ((line: string) => void process.stderr.write(`halfswing: ${line}\n`));
  let results: ResultSource | null = o.pipeline ? (o.createResults?.() ?? createResultSource({}, warn)) : null;
  let inFlight: Promise<void> | null = null;
  const dropWorker = (e: unknown): void => {
    if (!results) return;
    void results.close().catch(() => {});
    results = null;
    warn(`g is now computed on the main thread (result worker failed: ${(e as Error).message})`);
  };
  /** A fresh g of every entry fed so far: from the worker when there is one, else in-thread. */
  const refreshG = async (t: number): Promise<void> => {
    if (!o.pipeline) return;
    const t0 = performance.now();
    let r;
    if (results) {
      try {
        r = await results.result({ rows: false });
      } catch (e) {
        dropWorker(e);
      }
    }
    const inThread = r === undefined;
    r ??= o.pipeline.result({ rows: false });
    g = { value: r.g_m_s2, u: r.g_u_m_s2 };
    // The full analysis grows with the run: in-thread, redo g at most as often as it stays under a tenth of
    // the time; in the worker, under about a quarter of a core.
    const gCostUs = (performance.now() - t0) * 1000;
    gDueUs = t + Math.max(o.statusEveryMs * 1000, (inThread ? 10 : 4) * gCostUs);
  };

  const feed = (e: JournalEntry): void => {
    o.pipeline?.push(e);
    results?.push(e);
  };
  let closed!: () => void;
  const linkClosed = new Promise<void>((r) => (closed = r));
  const session = startRecording({
    link: o.link,
    writer: o.writer,
    header: o.header,
    onEntry: feed,
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
  const started = (): boolean => session.started();

  const snapshot = (): RecorderStatus => {
    const t = o.now();
    const stats = o.link.stats();
    const dt = (t - rate.atUs) / 1e6;
    if (dt >= 0.5) rate = { atUs: t, lines: stats.lines, perS: (stats.lines - rate.lines) / dt };
    const warnings = [...(o.warnings?.() ?? [])];
    if (rate.perS > flood) {
      warnings.push(`device is flooding: ${Math.round(rate.perS)} lines/s (check the gate for noise or bounce)`);
      if (!flooding && started() && !error) session.note(t, `device flooding: ${Math.round(rate.perS)} lines/s`);
      flooding = true;
    } else flooding = false;
    // g comes from the last finished analysis; a new one starts when due (it lands in a later status).
    if (o.pipeline && started() && t >= gDueUs && !inFlight && state !== 'stopped') {
      inFlight = refreshG(t).finally(() => (inFlight = null));
    }
    return buildStatus({
      wall: wallNow(),
      pid: o.pid ?? process.pid,
      state,
      port: o.link.path(),
      journal: o.writer.path,
      journalBytes: o.writer.size(),
      hostUs: t,
      linesPerS: rate.perS,
      link: stats,
      live: o.pipeline?.live(t),
      g,
      warnings,
    });
  };

  const tick = setInterval(() => o.onStatus?.(snapshot()), o.statusEveryMs);
  const stop = (): void => void o.link.close(o.stopReason?.() ?? 'shutdown');
  if (o.signal.aborted) stop();
  else o.signal.addEventListener('abort', stop, { once: true });
  try {
    await linkClosed;
  } finally {
    clearInterval(tick);
    o.signal.removeEventListener('abort', stop);
  }
  if (!started() && !error) {
    await results?.close().catch(() => {});
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
  await inFlight;
  if (started()) await refreshG(o.now());
  await results?.close().catch(() => {});
  const status = snapshot();
  o.onStatus?.(status);
  return error ? { status, error } : { status };
}
