// Full analysis off the event loop: a worker-thread pipeline fed the same entries, with an in-thread fallback.
import { Worker } from 'node:worker_threads';
import type { JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { createRunPipeline, type PipelineOptions } from './run-pipeline.ts';
import type { FromWorker, ToWorker } from './result-worker-protocol.ts';

/** Where full results come from: the same entries in, the same `AnalysisResult` as `analyzeEntries` out. */
export interface ResultSource {
  push(entry: JournalEntry): void;
  /** Starts over with nothing pushed (the estimates restarted). */
  reset(): void;
  /** The full analysis of every entry pushed before this call. */
  result(opts?: { rows?: boolean }): Promise<AnalysisResult>;
  /** Ends the worker; pending requests reject. Safe to call twice. */
  close(): Promise<void>;
  readonly inThread: boolean;
}

declare global {
  interface ImportMeta {
    /** true in the bundle (bin/build.js defines it); undefined when the sources run through tsx or vitest. */
    readonly bundled?: boolean;
  }
}

/** The bundle has the compiled worker beside its chunks; from source, a boot file registers tsx in the worker first. */
const WORKER_URL = import.meta.bundled ? new URL('./result-worker.js', import.meta.url) : new URL('./result-worker-boot.js', import.meta.url);

/** Entries are posted in batches of at most this many (one message per batch keeps the copying cheap). */
const BATCH = 2000;

/** The in-thread source: the behaviour before the worker, used when a worker cannot start. */
export function inThreadResultSource(opts: PipelineOptions = {}): ResultSource {
  let p = createRunPipeline(opts);
  return {
    inThread: true,
    push: (e) => p.push(e),
    reset: () => void (p = createRunPipeline(opts)),
    result: async (o) => p.result({ rows: o?.rows ?? true }),
    close: async () => {},
  };
}

/** A source backed by a worker thread; throws when the worker cannot be created. */
export function workerResultSource(opts: PipelineOptions = {}): ResultSource {
  const worker = new Worker(WORKER_URL, { workerData: opts });
  // Never the reason the process stays alive: every exit path works even if close() is missed.
  worker.unref();
  let batch: JournalEntry[] = [];
  let flushQueued = false;
  let nextId = 1;
  let closed = false;
  const waiting = new Map<number, { resolve: (r: AnalysisResult) => void; reject: (e: Error) => void }>();
  const failAll = (err: Error): void => {
    for (const w of waiting.values()) w.reject(err);
    waiting.clear();
  };
  const post = (m: ToWorker): void => worker.postMessage(m);
  const flush = (): void => {
    flushQueued = false;
    if (batch.length && !closed) post({ type: 'push', entries: batch });
    batch = [];
  };
  worker.on('message', (m: FromWorker) => {
    const w = waiting.get(m.id);
    if (!w) return;
    waiting.delete(m.id);
    if (m.type === 'result') w.resolve(m.result);
    else w.reject(new Error(m.message));
  });
  worker.on('error', (e) => failAll(e));
  worker.on('exit', () => {
    closed = true;
    failAll(new Error('result worker stopped'));
  });
  return {
    inThread: false,
    push(e) {
      batch.push(e);
      if (batch.length >= BATCH) flush();
      else if (!flushQueued) {
        flushQueued = true;
        queueMicrotask(flush);
      }
    },
    reset() {
      batch = [];
      if (!closed) post({ type: 'reset' });
    },
    result(o) {
      if (closed) return Promise.reject(new Error('result worker stopped'));
      flush();
      const id = nextId++;
      return new Promise((resolve, reject) => {
        waiting.set(id, { resolve, reject });
        post({ type: 'result', id, rows: o?.rows ?? true });
      });
    },
    async close() {
      if (closed) return;
      closed = true;
      await worker.terminate();
    },
  };
}

/** A worker source, or the in-thread one with a one-line warning when no worker can start. */
export function createResultSource(opts: PipelineOptions = {}, warn: (line: string) => void = () => {}): ResultSource {
  try {
    return workerResultSource(opts);
  } catch (e) {
    warn(`full analysis runs on the main thread (no worker: ${(e as Error).message})`);
    return inThreadResultSource(opts);
  }
}
