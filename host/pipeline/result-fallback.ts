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
  /** Drops the worker after `e`, warning once. */
  fail(e: unknown): void;
  close(): Promise<void>;
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
    fail,
    async close() {
      const w = worker;
      worker = null;
      await w?.close().catch(() => {});
    },
  };
}
