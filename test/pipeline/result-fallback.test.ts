// The one worker-fallback policy of the recorder and the live view: a failing worker is dropped once, with one line.
import { describe, expect, it } from 'vitest';
import type { AnalysisResult } from '../../host/analysis/result.ts';
import type { ResultSource } from '../../host/pipeline/result-client.ts';
import { refreshGap, workerWithFallback } from '../../host/pipeline/result-fallback.ts';
import type { JournalEntry } from '../../protocol/journal.ts';

/** A worker stand-in that answers `answers` times, then fails. */
function flakyWorker(answers: number) {
  const pushed: JournalEntry[] = [];
  let closes = 0;
  let asked = 0;
  const src: ResultSource = {
    inThread: false,
    push: (e) => void pushed.push(e),
    reset: () => {},
    result: async () => {
      if (asked++ >= answers) throw new Error('worker died');
      return { g_m_s2: 9.81 } as AnalysisResult;
    },
    close: async () => void closes++,
  };
  return { src, pushed, closes: () => closes, asked: () => asked };
}

const entry: JournalEntry = { kind: 'data', hostUs: 1, line: 'T 0 0 0 1 *00' };

describe('workerWithFallback', () => {
  it('passes results through while the worker works, then drops it once with one line and answers undefined', async () => {
    const w = flakyWorker(1);
    const lines: string[] = [];
    const f = workerWithFallback(w.src, (l) => lines.push(l));
    f.push(entry);
    expect((await f.result())?.g_m_s2).toBe(9.81);
    expect(await f.result()).toBeUndefined();
    expect(lines).toEqual(['full analysis now runs on the main thread (result worker failed: worker died)']);
    expect(f.worker).toBeNull();
    expect(w.closes()).toBe(1);
    // After the failure nothing more goes to the dead worker, nor is it asked again, and nothing more is said.
    f.push(entry);
    expect(await f.result()).toBeUndefined();
    expect(w.pushed).toHaveLength(1);
    expect(w.asked()).toBe(2);
    expect(lines).toHaveLength(1);
  });

  it('without a worker: results are always in-thread (undefined), and nothing is warned', async () => {
    const lines: string[] = [];
    const f = workerWithFallback(null, (l) => lines.push(l));
    f.push(entry);
    expect(await f.result()).toBeUndefined();
    await f.close();
    expect(lines).toEqual([]);
  });

  it('a close on purpose is no failure: no warning for the request it cut', async () => {
    const lines: string[] = [];
    let reject!: (e: Error) => void;
    const src = { ...flakyWorker(0).src, result: () => new Promise<AnalysisResult>((_, r) => (reject = r)) };
    const f = workerWithFallback(src, (l) => lines.push(l));
    const pending = f.result();
    await f.close();
    reject(new Error('result worker stopped'));
    expect(await pending).toBeUndefined();
    expect(lines).toEqual([]);
  });
});

describe('refreshGap', () => {
  it('paces the next full result by its cost: 10× in-thread, 4× in a worker, never under the minimum', () => {
    expect(refreshGap(500, 20, false)).toBe(500);
    expect(refreshGap(500, 80, false)).toBe(800);
    expect(refreshGap(500, 80, true)).toBe(500);
    expect(refreshGap(500, 300, true)).toBe(1200);
  });
});
