// The view's feeds: a journal followed while it grows (watch), and a board's link journaled as it arrives (live).
import { appendFileSync, mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { followJournal } from '../../host/journal/follow-journal.ts';
import { openJournalWriter } from '../../host/journal/journal-writer.ts';
import type { LinkEvent } from '../../host/link/device-link.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { JOURNAL_MAGIC, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import type { HelloRecord } from '../../protocol/records.ts';
import { journalFeed } from '../../host/tui/feeds/journal-feed.ts';
import { deviceFeed, type FeedLink } from '../../host/tui/feeds/device-feed.ts';

const tmp = (): string => mkdtempSync(join(tmpdir(), 'halfswing-tui-feed-'));
const hello: HelloRecord = { kind: 'H', seq: 0, proto: 1, fw: '0.1.0', mcu: 'm328p', hz: 16_000_000, ch: 2, boot: 0x0a3f, extra: {} };

async function take(it: AsyncIterator<JournalEntry>, n: number): Promise<JournalEntry[]> {
  const out: JournalEntry[] = [];
  while (out.length < n) {
    const r = await it.next();
    if (r.done) break;
    out.push(r.value);
  }
  return out;
}

describe('journal feed (watch)', () => {
  it('follows lines appended after it started, and reports the file size', async () => {
    const dir = tmp();
    const path = join(dir, 'run.journal');
    writeFileSync(path, `${JOURNAL_MAGIC}\n#start 2026-01-05T09:00:00.000Z\n#source test\n1000 ${encodeRecord(hello)}\n`);
    let now = 0;
    const feed = journalFeed({ path, follow: (p, o) => followJournal(p, { ...o, pollMs: 10 }), sizeOf: (p) => readFileSync(p).length, nowMs: () => now });
    const it = feed.entries[Symbol.asyncIterator]();
    expect((await take(it, 4)).map((e) => e.kind)).toEqual(['magic', 'start', 'source', 'data']);
    appendFileSync(path, `2000 ${encodeRecord({ kind: 'T', seq: 1, ticks: 16_000_000, lost: 0, levels: 1 })}\n#@2500 note moved the gate\n`);
    const more = await take(it, 2);
    expect(more.map((e) => e.kind)).toEqual(['data', 'annotation']);
    // Two seconds after the last line: still being written (quiet for 3 heartbeats + 1 s, it would not be).
    now = 2000;
    const st = feed.status();
    expect(st.connection.kind).toBe('following');
    expect(st.journal?.bytes).toBe(readFileSync(path).length);
    expect(st.writesJournal).toBe(false);
    await feed.close();
    expect((await it.next()).done).toBe(true);
  });
});

/** A link double: the test emits events as the board would. */
function fakeLink() {
  const listeners: ((e: LinkEvent) => void)[] = [];
  let resolveReady!: (h: HelloRecord) => void;
  let closed = false;
  const link: FeedLink & { emit(e: LinkEvent): void; closed(): boolean } = {
    ready: new Promise((r) => (resolveReady = r)),
    onEvent: (fn) => void listeners.push(fn),
    path: () => '/dev/ttyFAKE0',
    async close() {
      if (closed) return;
      closed = true;
      for (const fn of listeners) fn({ type: 'state', hostUs: 9000, state: 'closed' });
    },
    emit: (e) => listeners.forEach((fn) => fn(e)),
    closed: () => closed,
  };
  return { link, resolveReady };
}

describe('device feed (live)', () => {
  it('journals every line and annotation as it arrives, shows the same entries, and takes notes', async () => {
    const dir = tmp();
    const path = join(dir, 'live.journal');
    const writer = openJournalWriter(path);
    const { link, resolveReady } = fakeLink();
    let us = 0;
    const feed = deviceFeed({ link, writer, nowUs: () => us, start: new Date('2026-01-05T09:00:00Z'), source: 'test', rigJson: '{"length_m":1,"flag_width_m":0.02}', portLabel: 'auto' });
    expect(feed.status().connection.kind).toBe('opening');
    link.emit({ type: 'state', hostUs: 10, state: 'waiting-hello', path: '/dev/ttyFAKE0' });
    expect(feed.status().connection.kind).toBe('waiting-hello');
    const h = encodeRecord(hello);
    link.emit({ type: 'annotation', hostUs: 100, word: 'connect', text: '/dev/ttyFAKE0 fw=0.1.0 boot=0a3f' });
    link.emit({ type: 'line', hostUs: 120, line: h });
    link.emit({ type: 'state', hostUs: 120, state: 'connected', path: '/dev/ttyFAKE0', hello, reconnects: 0 });
    resolveReady(hello);
    link.emit({ type: 'line', hostUs: 500, line: 'garbage that does not decode' });
    link.emit({ type: 'state', hostUs: 600, state: 'reconnecting', attempt: 2, delayMs: 500, reason: 'unplugged' });
    expect(feed.status().connection).toEqual({ kind: 'reconnecting', retries: 2 });
    us = 700;
    await feed.note!('bumped the table');
    expect(feed.status().writesJournal).toBe(true);
    // The journal already holds everything, before anyone reads the entries.
    const text = readFileSync(path, 'latin1').split('\n').filter(Boolean);
    expect(text[0]).toBe(JOURNAL_MAGIC);
    expect(text.slice(1, 4).map((l) => parseJournalLine(l).kind)).toEqual(['start', 'rig', 'source']);
    expect(text.slice(4)).toEqual(['#@100 connect /dev/ttyFAKE0 fw=0.1.0 boot=0a3f', `120 ${h}`, '500 garbage that does not decode', '#@700 note bumped the table']);

    const it = feed.entries[Symbol.asyncIterator]();
    const seen = await take(it, 8);
    expect(seen.map((e) => e.kind)).toEqual(['magic', 'start', 'rig', 'source', 'annotation', 'data', 'data', 'annotation']);
    await feed.close();
    expect(link.closed()).toBe(true);
    expect((await it.next()).done).toBe(true);
    expect(feed.status().connection.kind).toBe('ended');
  });

  it('leaves no journal behind when the board never answers', async () => {
    const dir = tmp();
    const path = join(dir, 'never.journal');
    const writer = openJournalWriter(path);
    const { link } = fakeLink();
    const feed = deviceFeed({ link, writer, nowUs: () => 0, start: new Date(), source: 'test', portLabel: '/dev/ttyFAKE0' });
    await feed.close();
    expect(existsSync(path)).toBe(false);
  });
});
