// The result worker with its in-thread fallback, one policy for the recorder and the live view.
import type { JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { ResultSource } from './result-client.ts';

/**
 * A worker source (or none) that, once it fails, is closed and dropped with one line for the user; from then on
 * the caller computes results in-thread from its own pipeline, which has seen the same entries.
 */
export interface WorkerWithFallback {
  /** The worker while it works; null once it failed, or when there never was one. */
  readonly worker: ResultSource | null;
  /** Feeds the worker (nothing after it failed: the caller's own pipeline has the entries). */
  push(entry: JournalEntry): void;
  /** The worker's full result, or undefined when there is no worker (any more): compute it in-thread then. */
  result(opts?: { rows?: boolean }): Promise<AnalysisResult | undefined>;
  close(): Promise<void>;
}

/** In-thread, the full analysis blocks the caller: redo it at most as often as it stays under a tenth of the time. */
const IN_THREAD_COST_FACTOR = 10;
/** In a worker it blocks nothing: keep the worker under about a quarter of a core. */
const WORKER_COST_FACTOR = 4;

/**
 * How long to wait before the next full result, in the unit of `minGap` and `cost` (the last one's duration): the
 * analysis grows with the run, so its pace follows its cost, and never faster than `minGap`.
 */
export function refreshGap(minGap: number, cost: number, inWorker: boolean): number {
  return Math.max(minGap, (inWorker ? WORKER_COST_FACTOR : IN_THREAD_COST_FACTOR) * cost);
}

export function workerWithFallback(source: ResultSource | null, warn: (line: string) => void): WorkerWithFallback {
  let worker = source;
  const fail = (e: unknown): void => {
    if (!worker) return;
    const w = worker;
    worker = null;
    void w.close().catch(() => {});
    warn(`full analysis now runs on the main thread (result worker failed: ${(e as Error).message})`);
  };
  return {
    get worker() {
      return worker;
    },
    push: (e) => worker?.push(e),
    async result(opts) {
      const w = worker;
      if (!w) return undefined;
      try {
        return await w.result(opts);
      } catch (e) {
        // A worker closed on purpose meanwhile is no failure to report.
        if (worker === w) fail(e);
        return undefined;
      }
    },
    async close() {
      const w = worker;
      worker = null;
      await w?.close().catch(() => {});
    },
  };
}
