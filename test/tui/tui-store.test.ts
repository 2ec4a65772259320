// The view's store: the same numbers as `analyze` for the same lines, throttled publishing, and restarting the estimates.
import { afterEach, describe, expect, it } from 'vitest';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { createLiveStore, type LiveStoreOptions, type PipelineLike } from '../../host/tui/live-store.ts';
import { medianSpacing } from '../../host/tui/heartbeat-cadence.ts';
import { inThreadResultSource, workerResultSource, type ResultSource } from '../../host/pipeline/result-client.ts';

function journal(seconds: number, scenario = 'demo-low-q', seed = 7): { entries: JournalEntry[]; T0: number } {
  const { lines, truth } = simulateJournal(loadScenario(scenario), { seed, durationS: seconds });
  return { entries: [...lines].map(parseJournalLine), T0: truth.physics.T0_s };
}

/** A hand-driven interval timer and clock. */
function manualTime() {
  let fn: (() => void) | null = null;
  const t = { now: 0, ticks: 0 };
  return {
    t,
    timers: { setInterval: (f: () => void) => ((fn = f), 1), clearInterval: () => (fn = null) },
    advance(ms: number) {
      t.now += ms;
      t.ticks++;
      fn?.();
    },
  };
}

/** The full result computed in-thread, and in a worker thread (as the commands run it). */
const warnings: string[] = [];
const resultModes: [string, Pick<LiveStoreOptions, 'createResults' | 'warn'>][] = [
  ['in-thread', {}],
  // A warning would mean the store fell back to in-thread results: the worker path was not tested.
  ['worker', { createResults: () => workerResultSource(), warn: (l) => warnings.push(l) }],
];

describe.each(resultModes)('live store, full result %s', (_mode, results) => {
  afterEach(() => expect(warnings).toEqual([]));
  it('ends with exactly the analysis `analyze` gives for the same entries', async () => {
    const { entries, T0 } = journal(600);
    const m = manualTime();
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => m.t.now, timers: m.timers, ...results });
    entries.forEach((e, i) => {
      store.push(e);
      if (i % 50 === 0) m.advance(100);
    });
    await store.flush();
    const shown = store.getSnapshot().result;
    // Everything but the swing rows, which the store leaves out (the view never reads them).
    expect(shown.swings).toEqual([]);
    expect(shown).toEqual({ ...analyzeEntries(entries), swings: [] });
    // And it is the right pendulum: T0 within 1e-4 of the simulator's truth.
    expect(Math.abs(shown.T0_s! / T0 - 1)).toBeLessThan(1e-4);
    store.stop();
  });

  it('restarts the estimates from now, keeping the run-wide health counts', async () => {
    const { entries } = journal(600, 'night-run-faults', 3);
    const m = manualTime();
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => m.t.now, timers: m.timers, ...results });
    const half = Math.floor(entries.length / 2);
    entries.slice(0, half).forEach((e) => store.push(e));
    await store.flush();
    const before = store.getSnapshot();
    store.restart();
    entries.slice(half).forEach((e) => store.push(e));
    await store.flush();
    const after = store.getSnapshot();
    const whole = analyzeEntries(entries);
    expect(after.restartedAt_s).toBeCloseTo(before.lastHost_s!, 9);
    // Only the second half's passes are in the estimates, and T0 is still the pendulum's.
    expect(after.result.passes).toBeLessThan(whole.passes * 0.6);
    expect(after.result.passes).toBeGreaterThan(whole.passes * 0.4);
    expect(Math.abs(after.result.T0_s! / whole.T0_s! - 1)).toBeLessThan(1e-3);
    // The device, link and line counts are those of the whole run.
    expect(after.live.counts.crc_errors).toBe(whole.counts.crc_errors);
    expect(after.live.counts.bad_lines).toBe(whole.counts.bad_lines);
    expect(after.live.hello).toEqual(before.live.hello);
    store.stop();
  });
});

describe('live store', () => {
  it('a result worker that fails mid-run is dropped with one line; the store goes on in-thread to the same end', async () => {
    const { entries } = journal(300);
    const m = manualTime();
    const lines: string[] = [];
    // A worker stand-in (the same analysis) that answers twice, then fails as a crashed worker does.
    let asked = 0;
    const flaky = (): ResultSource => {
      const local = inThreadResultSource();
      return { ...local, inThread: false, result: async (o) => (asked++ < 2 ? local.result(o) : Promise.reject(new Error('worker died'))) };
    };
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => m.t.now, timers: m.timers, createResults: flaky, warn: (l) => lines.push(l) });
    const third = Math.floor(entries.length / 3);
    entries.slice(0, third).forEach((e) => store.push(e));
    await store.flush();
    await store.flush();
    expect(lines).toEqual([]);
    await store.flush();
    expect(asked).toBe(3);
    expect(lines).toEqual(['full analysis now runs on the main thread (result worker failed: worker died)']);
    expect(store.getSnapshot().result).toEqual({ ...analyzeEntries(entries.slice(0, third)), swings: [] });
    // From now on the timer's publishes compute the result in-thread, at once, and the worker is not asked again.
    entries.slice(third).forEach((e) => store.push(e));
    m.advance(1000);
    expect(store.getSnapshot().result).toEqual({ ...analyzeEntries(entries), swings: [] });
    await store.flush();
    expect(asked).toBe(3);
    expect(lines).toHaveLength(1);
    store.stop();
  });

  it('publishes at most once per timer tick and recomputes the full result at most twice a second', () => {
    const { entries } = journal(300);
    const m = manualTime();
    let results = 0;
    const counting = (): PipelineLike => {
      const p = createRunPipeline();
      return { push: (e) => p.push(e), live: (n) => p.live(n), result: () => (results++, p.result()) };
    };
    const store = createLiveStore({ createPipeline: counting, nowMs: () => m.t.now, timers: m.timers, liveHz: 10, resultHz: 2 });
    let publishes = 0;
    store.subscribe(() => publishes++);
    const before = results;
    entries.forEach((e, i) => {
      store.push(e);
      if (i % 10 === 0) m.advance(100);
    });
    // Every tick publishes (lines keep coming) but no more often; 10 ticks per second and ≤ 2 results.
    expect(publishes).toBeLessThanOrEqual(m.t.ticks);
    expect(results - before).toBeLessThanOrEqual(Math.ceil(m.t.now / 500) + 1);
    expect(results - before).toBeGreaterThan(0);
  });

  it('keeps publishing while nothing arrives, so time-based warnings can appear', () => {
    const m = manualTime();
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => m.t.now, timers: m.timers });
    let publishes = 0;
    store.subscribe(() => publishes++);
    for (let i = 0; i < 50; i++) m.advance(100);
    expect(publishes).toBeGreaterThanOrEqual(4);
    expect(publishes).toBeLessThanOrEqual(6);
  });

  it('knows the rig from the journal and the heartbeat spacing from the lines', async () => {
    const { entries } = journal(60);
    const m = manualTime();
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => m.t.now, timers: m.timers });
    entries.forEach((e) => store.push(e));
    await store.flush();
    const s = store.getSnapshot();
    expect(s.rig?.length_m).toBe(loadScenario('demo-low-q').rig.length_m);
    // The device sends one heartbeat per second of device time (protocol/SPEC.md §4.3), on a clock within ±1 %.
    expect(s.heartbeatInterval_s!).toBeGreaterThan(0.99);
    expect(s.heartbeatInterval_s!).toBeLessThan(1.01);
  });

  it('takes the median spacing, so one lost heartbeat does not double it', () => {
    expect(medianSpacing([0, 1, 2, 4, 5, 6])).toBe(1);
    expect(medianSpacing([3])).toBeNull();
  });
});
