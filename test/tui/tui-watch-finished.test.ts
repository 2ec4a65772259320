// `watch` of a finished recording (#14 item 10): a journal that ends with the recorder's `stop` annotation
// (protocol/JOURNAL.md) is shown as ended, with when; its run clock stops at the journal's end and no warning counts
// the time since. A journal still growing behaves as before. Time is injected: no wall-clock sleeps.
import { describe, expect, it } from 'vitest';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import type { FollowOptions } from '../../host/journal/follow-journal.ts';
import { journalFeed } from '../../host/tui/feeds/journal-feed.ts';
import { createLiveStore } from '../../host/tui/live-store.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { estimateNow } from '../../host/tui/components/app.tsx';
import { buildViewModel } from '../../host/tui/view-model.ts';
import { formatDuration } from '../../host/tui/format.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

/** A follower over lines in memory: yields them, then waits for more (as following a file does) until aborted. */
function memoryFollower(lines: string[]) {
  let wake: (() => void) | null = null;
  const push = (...more: string[]): void => {
    lines.push(...more);
    wake?.();
  };
  async function* follow(_path: string, o: FollowOptions): AsyncGenerator<JournalEntry> {
    let i = 0;
    for (;;) {
      while (i < lines.length) yield parseJournalLine(lines[i++]!);
      if (o.signal?.aborted) return;
      await new Promise<void>((r) => {
        wake = r;
        o.signal?.addEventListener('abort', () => r(), { once: true });
      });
    }
  }
  return { follow, push };
}

const sim = [...simulateJournal(loadScenario('demo-low-q'), { seed: 1, durationS: 200 }).lines];
const lastUs = Math.max(...sim.map(parseJournalLine).map((e) => (e.kind === 'data' || e.kind === 'annotation' ? e.hostUs : 0)));
const startIso = (sim.map(parseJournalLine).find((e) => e.kind === 'start') as Extract<JournalEntry, { kind: 'start' }>).epochMs;
const STOP = `#@${lastUs + 2000} stop shutdown (SIGTERM)`;

/** Watches `lines` (following, not replaying) into a live store; returns what the screen shows `laterS` after the last line arrived. */
async function watchAt(lines: string[], laterS: number) {
  let wallMs = 1_000_000;
  const { follow } = memoryFollower([...lines]);
  const feed = journalFeed({ path: 'run.journal', follow, sizeOf: () => 1234, nowMs: () => wallMs });
  const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => wallMs, timers: { setInterval: () => 0, clearInterval: () => {} } });
  const it = feed.entries[Symbol.asyncIterator]();
  for (let k = 0; k < lines.length; k++) store.push((await it.next()).value as JournalEntry);
  await store.flush();
  wallMs += laterS * 1000;
  const snap = store.getSnapshot();
  const status = feed.status();
  const now_s = estimateNow(snap, status, wallMs);
  const vm = buildViewModel({ feed: status, live: snap.live, result: snap.result, rig: snap.rig, now_s, since_s: snap.firstHost_s ?? 0, heartbeatInterval_s: snap.heartbeatInterval_s, restartedAt_s: null, paused: false });
  store.stop();
  await feed.close();
  return { vm, now_s, status, item: (label: string) => vm.status.find((s) => s.label === label)?.value };
}

describe('watch of a finished recording', () => {
  it('ended with the stop: says so and when, the run clock stops at the journal’s end, no silence warnings 136 s later', async () => {
    const v = await watchAt([...sim, STOP], 136);
    const when = new Date(startIso + (lastUs + 2000) / 1000).toISOString();
    expect(v.item('mode')).toBe(`ended: recording ended ${when.slice(0, 10)} ${when.slice(11, 19)} UTC (shutdown (SIGTERM))`);
    expect(v.now_s).toBe((lastUs + 2000) / 1e6);
    expect(v.item('run')).toBe(formatDuration((lastUs + 2000) / 1e6));
    const kinds = v.vm.warnings.map((w) => w.kind);
    expect(kinds).not.toContain('no-passes');
    expect(kinds).not.toContain('heartbeats-missing');
  });

  it('a journal still growing (no stop at its end) behaves as before: following, the clock runs on, both warnings after 136 s', async () => {
    const v = await watchAt(sim, 136);
    expect(v.item('mode')).toBe('following the file');
    expect(v.now_s).toBeGreaterThan(lastUs / 1e6 + 130);
    const kinds = v.vm.warnings.map((w) => w.kind);
    expect(kinds).toContain('no-passes');
    expect(kinds).toContain('heartbeats-missing');
  });

  it('a recorder resumed after the stop (a new section) makes the journal live again', async () => {
    const { follow, push } = memoryFollower([...sim, STOP]);
    const feed = journalFeed({ path: 'run.journal', follow, sizeOf: () => 1, nowMs: () => 0 });
    const it = feed.entries[Symbol.asyncIterator]();
    for (let k = 0; k <= sim.length; k++) await it.next();
    expect(feed.status().connection.kind).toBe('ended');
    const again = ['#start 2026-01-05T10:00:00.000Z', '#source test', '1000 T 1 f42400 0 1 *fc'];
    push(...again);
    for (let k = 0; k < again.length; k++) await it.next();
    expect(feed.status().connection).toEqual({ kind: 'following' });
    await feed.close();
  });
});
