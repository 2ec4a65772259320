import { appendFileSync, mkdtempSync, renameSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { followJournal } from '../../host/journal/follow-journal.ts';
import type { JournalEntry } from '../../protocol/journal.ts';

let dir: string;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-follow-'))));
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const HEAD = '#halfswing-journal 1\n#start 2026-03-01T12:00:00.000Z\n#source test\n';
/**
 * Starts following and returns the growing list of entries, the count of polls so far, and a stop function. Each
 * poll interval is one event-loop turn (the follower's sleep is injected), so tests count polls, not milliseconds.
 */
function start(path: string, opts: Parameters<typeof followJournal>[1] = {}): { got: JournalEntry[]; polls: () => number; stop: () => Promise<void>; resets: string[] } {
  const ac = new AbortController();
  const got: JournalEntry[] = [];
  const resets: string[] = [];
  let polls = 0;
  const sleep = async (): Promise<void> => {
    polls++;
    await new Promise<void>((r) => setImmediate(r));
  };
  const done = (async () => {
    for await (const e of followJournal(path, { pollMs: 5, sleep, signal: ac.signal, onReset: (w) => resets.push(w), ...opts })) got.push(e);
  })();
  return {
    got,
    polls: () => polls,
    resets,
    stop: async () => {
      ac.abort();
      await done;
    },
  };
}

async function until(pred: () => boolean, what: string): Promise<void> {
  for (let i = 0; i < 100_000 && !pred(); i++) await new Promise<void>((r) => setImmediate(r));
  if (!pred()) throw new Error(`timed out waiting for ${what}`);
}

/** Lets the follower poll the file `n` more times. */
async function polled(f: { polls: () => number }, n: number): Promise<void> {
  const target = f.polls() + n;
  await until(() => f.polls() >= target, `${n} polls`);
}

const dataLines = (es: JournalEntry[]): string[] => es.flatMap((e) => (e.kind === 'data' ? [e.line] : []));

describe('followJournal', () => {
  it('yields lines as they are appended and holds a partial last line back until its LF arrives', async () => {
    const p = join(dir, 'j');
    writeFileSync(p, `${HEAD}1 a\n`);
    const f = start(p);
    await until(() => dataLines(f.got).length === 1, 'first line');
    appendFileSync(p, '2 b');
    await polled(f, 5);
    expect(dataLines(f.got)).toEqual(['a']);
    appendFileSync(p, 'cd\n3 e\n');
    await until(() => dataLines(f.got).length === 3, 'completed lines');
    expect(dataLines(f.got)).toEqual(['a', 'bcd', 'e']);
    await f.stop();
  });

  it('starts over when the file is truncated or replaced', async () => {
    const p = join(dir, 'j');
    writeFileSync(p, `${HEAD}1 a\n2 b\n`);
    const f = start(p);
    await until(() => dataLines(f.got).length === 2, 'lines');
    truncateSync(p, 0);
    writeFileSync(p, `${HEAD}1 z\n`);
    await until(() => dataLines(f.got).includes('z'), 'after truncation');
    expect(f.resets).toContain('truncated');
    writeFileSync(join(dir, 'k'), `${HEAD}1 new\n`);
    renameSync(join(dir, 'k'), p);
    await until(() => dataLines(f.got).includes('new'), 'after replacement');
    expect(f.resets).toContain('replaced');
    await f.stop();
  });

  it('waits for a journal that does not exist yet when asked to', async () => {
    const p = join(dir, 'later');
    const f = start(p, { waitForFile: true });
    await polled(f, 5);
    writeFileSync(p, `${HEAD}1 a\n`);
    await until(() => dataLines(f.got).length === 1, 'line');
    await f.stop();
  });

  it('rejects a file that is not a journal', async () => {
    const p = join(dir, 'x');
    writeFileSync(p, 'hello\n');
    const it = followJournal(p, { follow: false });
    await expect(it.next()).rejects.toThrow(/not a halfswing journal/);
  });

  it('replay: ends at the end of the file, and paces entries by host time divided by the speed', async () => {
    const p = join(dir, 'j');
    // Two blocks: the second restarts host time at 0; replay continues from the first block's end.
    writeFileSync(p, `${HEAD}0 a\n1000000 b\n${HEAD.slice(HEAD.indexOf('#start'))}500000 c\n`);
    let now = 0;
    const sleeps: number[] = [];
    const sleep = async (ms: number): Promise<void> => {
      sleeps.push(ms);
      now += ms;
    };
    const got: JournalEntry[] = [];
    for await (const e of followJournal(p, { follow: false, speed: 10, sleep, nowMs: () => now })) got.push(e);
    expect(dataLines(got)).toEqual(['a', 'b', 'c']);
    // 1 s of host time at speed 10 → 100 ms; then 0.5 s more → 50 ms.
    expect(sleeps).toEqual([100, 50]);
  });
});
