// Real-time pacing of journal lines: releases each line when its host time comes, at N× real time.

export interface PaceOptions {
  /** N× real time (1 = real time); Infinity means no waiting. */
  readonly speed: number;
  /** Monotonic milliseconds (default performance.now). */
  readonly now?: () => number;
  /** Waits `ms` or until the signal aborts (default setTimeout based). */
  readonly sleep?: (ms: number, signal?: AbortSignal) => Promise<void>;
  readonly signal?: AbortSignal;
}

/** Host microseconds of a journal line: data and annotation lines have one, header lines do not. */
export function lineHostUs(line: string): number | undefined {
  const m = /^(?:#@)?(0|[1-9][0-9]{0,15})[ ]/.exec(line);
  return m ? Number(m[1]) : undefined;
}

const defaultSleep = (ms: number, signal?: AbortSignal): Promise<void> =>
  new Promise((resolve) => {
    if (signal?.aborted) return resolve();
    const onAbort = (): void => {
      clearTimeout(timer);
      resolve();
    };
    const timer = setTimeout(() => {
      signal?.removeEventListener('abort', onAbort);
      resolve();
    }, ms);
    signal?.addEventListener('abort', onAbort, { once: true });
  });

/**
 * Yields journal lines no sooner than their host time / speed after the first call. Header lines pass at once.
 * Stops early, without error, when the signal aborts. A `#start` line of a resumed section restarts nothing:
 * simulated journals have one time base.
 */
export async function* paceLines(lines: Iterable<string> | AsyncIterable<string>, opts: PaceOptions): AsyncGenerator<string> {
  const now = opts.now ?? (() => performance.now());
  const sleep = opts.sleep ?? defaultSleep;
  const t0 = now();
  for await (const line of lines as AsyncIterable<string>) {
    if (opts.signal?.aborted) return;
    const us = lineHostUs(line);
    if (us !== undefined && Number.isFinite(opts.speed)) {
      const due = t0 + us / 1000 / opts.speed;
      const wait = due - now();
      if (wait > 0) await sleep(wait, opts.signal);
      if (opts.signal?.aborted) return;
    }
    yield line;
  }
}
