// `watch` of a finished recording (#14 item 10): a journal that ends with the recorder's `stop` annotation
// (protocol/JOURNAL.md) is shown as ended, with when; its run clock stops at the journal's end and no warning counts
// the time since. One that ends without a stop (sim output, a recorder killed mid-line) is shown as not being
// written since its last line once it is quiet and that line is older than the heartbeat cadence allows; a journal
// still growing behaves as before. Time is injected (a monotonic and a wall clock): no wall-clock sleeps.
import { appendFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { followJournal, type FollowOptions } from '../../host/journal/follow-journal.ts';
import { journalFeed, notBeingWritten, type JournalFeedOptions } from '../../host/tui/feeds/journal-feed.ts';
import type { Feed } from '../../host/tui/feed.ts';
import { encodeRecord } from '../../protocol/encode.ts';
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

/**
 * A watch with both clocks injected: `mono` (the feed's and store's ms) and `wall` (ms since 1970). `take(n)`
 * pushes the next n entries the follower gives, each arriving at the current `mono`; `look()` is the screen now.
 */
function watcher(follow: JournalFeedOptions['follow'], wallAtStart: number, path = 'run.journal') {
  const clock = { mono: 1_000_000, wall: wallAtStart };
  const feed: Feed = journalFeed({ path, follow, sizeOf: () => 1234, nowMs: () => clock.mono, wallMs: () => clock.wall });
  const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => clock.mono, timers: { setInterval: () => 0, clearInterval: () => {} } });
  const it = feed.entries[Symbol.asyncIterator]();
  return {
    async take(n: number): Promise<void> {
      for (let k = 0; k < n; k++) store.push((await it.next()).value as JournalEntry);
      await store.flush();
    },
    advance(s: number): void {
      clock.mono += s * 1000;
      clock.wall += s * 1000;
    },
    look() {
      const snap = store.getSnapshot();
      const status = feed.status();
      const now_s = estimateNow(snap, status, clock.mono);
      const vm = buildViewModel({ feed: status, live: snap.live, result: snap.result, rig: snap.rig, now_s, since_s: snap.firstHost_s ?? 0, heartbeatInterval_s: snap.heartbeatInterval_s, restartedAt_s: null, paused: false });
      return { vm, now_s, status, item: (label: string) => vm.status.find((x) => x.label === label)?.value, kinds: vm.warnings.map((w) => w.kind) };
    },
    async close(): Promise<void> {
      store.stop();
      await feed.close();
    },
  };
}

/** Watches `lines` (following, not replaying) into a live store; returns what the screen shows `laterS` after the last line arrived. */
async function watchAt(lines: string[], laterS: number, wallAtStart = Date.parse('2026-12-05T22:00:00Z')) {
  const w = watcher(memoryFollower([...lines]).follow, wallAtStart);
  await w.take(lines.length);
  w.advance(laterS);
  const v = w.look();
  await w.close();
  return v;
}

/** "2026-01-05 09:03:20 UTC" of a journal's host time. */
const utcAt = (epochMs: number, hostUs: number): string => {
  const iso = new Date(epochMs + hostUs / 1000).toISOString();
  return `${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC`;
};

describe('watch of a finished recording', () => {
  it('ended with the stop: says so and when, the run clock stops at the journal’s end, no silence warnings 136 s later', async () => {
    const v = await watchAt([...sim, STOP], 136);
    expect(v.item('mode')).toBe(`ended: recording ended ${utcAt(startIso, lastUs + 2000)} (shutdown (SIGTERM))`);
    expect(v.now_s).toBe((lastUs + 2000) / 1e6);
    expect(v.item('run')).toBe(formatDuration((lastUs + 2000) / 1e6));
    expect(v.kinds).not.toContain('no-passes');
    expect(v.kinds).not.toContain('heartbeats-missing');
  });

  it('sim output (no stop, stamped months ago): following for its first quiet seconds, then not being written since its last line, clock stopped there, no silence warnings', async () => {
    // The sim's #start is the scenario's 2026-01-05; the wall clock says 2026-12-05: the last line is months old.
    const early = await watchAt(sim, 2);
    expect(early.item('mode')).toBe('following the file');
    const v = await watchAt(sim, 136);
    expect(v.status.connection.kind).toBe('not-written');
    expect(v.item('mode')).toBe(`not being written since ${utcAt(startIso, lastUs)}`);
    expect(v.now_s).toBe(lastUs / 1e6);
    expect(v.item('run')).toBe(formatDuration(lastUs / 1e6));
    expect(v.kinds).not.toContain('no-passes');
    expect(v.kinds).not.toContain('heartbeats-missing');
    // Told after QUIET_S = 3 s already: the wall clock shows the last line far older than three heartbeats.
    expect((await watchAt(sim, 3.1)).status.connection.kind).toBe('not-written');
  });

  it('without a wall clock to compare (a line stamped in the future, e.g. `sim --start` now), only the reader’s own quiet time decides: 3 heartbeats + 1 s', async () => {
    const future = Date.parse('2025-06-01T00:00:00Z');
    expect((await watchAt(sim, 3.9, future)).status.connection.kind).toBe('following');
    expect((await watchAt(sim, 4.1, future)).status.connection.kind).toBe('not-written');
  });

  it('a live journal that still grows (heartbeats go on, the swing stopped): following, the clock runs on, "no passes" warned', async () => {
    // The wall clock agrees with the journal's #start: the recorder is writing it now.
    const lines = [...sim];
    const { follow, push } = memoryFollower(lines.slice());
    const w = watcher(follow, startIso + lastUs / 1000);
    await w.take(lines.length);
    const data = sim.map(parseJournalLine).filter((e): e is Extract<JournalEntry, { kind: 'data' }> => e.kind === 'data');
    const beat = [...data].reverse().find((e) => e.line.startsWith('T '))!;
    const seq0 = Number.parseInt(data[data.length - 1]!.line.split(' ')[1]!, 16);
    const ticks0 = Number.parseInt(beat.line.split(' ')[2]!, 16);
    // 10 more heartbeats one second apart, no edges: the bob has stopped, the board and the recorder have not.
    let hostUs = lastUs;
    for (let k = 1; k <= 10; k++) {
      const at = beat.hostUs + k * 1_000_000;
      w.advance((at - hostUs) / 1e6);
      hostUs = at;
      push(`${at} ${encodeRecord({ kind: 'T', seq: (seq0 + k) & 0xffff, ticks: ticks0 + k * 16_000_000, lost: 0, levels: 1 })}`);
      await w.take(1);
    }
    w.advance(0.9);
    const v = w.look();
    expect(v.item('mode')).toBe('following the file');
    expect(v.now_s).toBeGreaterThan(hostUs / 1e6);
    expect(v.kinds).toContain('no-passes');
    expect(v.kinds).not.toContain('heartbeats-missing');
    await w.close();
  });
  it('a recorder killed mid-line (power loss): the cut line is held back; following for 3 heartbeats + 1 s, then not being written since the last whole line; a restarted recorder makes it live again', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-watch-cut-'));
    const path = join(dir, 'run.journal');
    const lines = sim.map((l) => (l.startsWith('#source ') ? '#source halfswing 0.1.0 record --port /dev/ttyACM0 (250000 baud)' : l));
    const whole = lines.slice(0, lines.length - 40);
    const cut = lines[lines.length - 40]!.slice(0, 12);
    writeFileSync(path, `${whole.join('\n')}\n${cut}`);
    const lastWholeUs = (parseJournalLine(whole[whole.length - 1]!) as { hostUs: number }).hostUs;
    const follow: JournalFeedOptions['follow'] = (p, o) => followJournal(p, { ...o, sleep: () => new Promise((r) => setImmediate(r)) });
    const w = watcher(follow, startIso + lastWholeUs / 1000, path);
    await w.take(whole.length);
    w.advance(2);
    const live = w.look();
    expect(live.item('mode')).toBe('following the file');
    expect(live.now_s).toBeGreaterThan(lastWholeUs / 1e6 + 1);
    w.advance(1.5);
    expect(w.look().status.connection.kind).toBe('following');
    w.advance(1);
    const v = w.look();
    expect(v.item('mode')).toBe(`not being written since ${utcAt(startIso, lastWholeUs)}`);
    expect(v.now_s).toBe(lastWholeUs / 1e6);
    expect(v.kinds).not.toContain('no-passes');
    expect(v.kinds).not.toContain('heartbeats-missing');
    // The recorder restarted on the same file: it ends the cut line, then opens a new section (protocol/JOURNAL.md).
    const hello = encodeRecord({ kind: 'H', seq: 0, proto: 1, fw: '0.1.0', mcu: 'm328p', hz: 16_000_000, ch: 2, boot: 0x0b0b, extra: {} });
    const again = [`#start ${new Date(startIso + lastWholeUs / 1000 + 60_000).toISOString()}`, '#source halfswing 0.1.0 record --port /dev/ttyACM0 (250000 baud)', `1500000 ${hello}`];
    w.advance(60);
    appendFileSync(path, `\n${again.join('\n')}\n`);
    await w.take(1 + again.length);
    const back = w.look();
    expect(back.status.connection).toEqual({ kind: 'following' });
    await w.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('a board with a 60 s heartbeat (P 60000): a journal quiet for 30 s is still live; past 3 periods + 1 s it is not being written', async () => {
    const hello = encodeRecord({ kind: 'H', seq: 0, proto: 1, fw: '0.1.0', mcu: 'm328p', hz: 16_000_000, ch: 2, boot: 0x0c0c, extra: {} });
    const epoch = Date.parse('2026-12-05T20:00:00Z');
    const beats = [1, 2, 3, 4].map((k) => `${1_000_000 + k * 60_000_000} ${encodeRecord({ kind: 'T', seq: k, ticks: k * 960_000_000, lost: 0, levels: 1 })}`);
    const lines = ['#halfswing-journal 1', `#start ${new Date(epoch).toISOString()}`, '#source test', `1000000 ${hello}`, ...beats];
    const lastMs = epoch + 241_000;
    const seen = async (quiet_s: number) => {
      const w = watcher(memoryFollower([...lines]).follow, lastMs);
      await w.take(lines.length);
      w.advance(quiet_s);
      const v = w.look();
      await w.close();
      return v.status.connection.kind;
    };
    expect(await seen(30)).toBe('following');
    expect(await seen(180)).toBe('following');
    expect(await seen(182)).toBe('not-written');
  });

  it('the rule itself: a few quiet seconds, and a last line older than 3 heartbeats + 1 s by either clock', () => {
    expect(notBeingWritten(2.9, 1e6, 1)).toBe(false); // quiet too short, however old the line
    expect(notBeingWritten(3, 4.1, 1)).toBe(true);
    expect(notBeingWritten(3, 3.9, 1)).toBe(false);
    expect(notBeingWritten(4.1, null, null)).toBe(true); // no wall clock: the reader's own quiet time, default 1 s cadence
    expect(notBeingWritten(4.1, -3600, 1)).toBe(true); // a line stamped in the future
    expect(notBeingWritten(3.5, -3600, 1)).toBe(false);
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
