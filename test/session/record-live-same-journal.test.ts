// `record` and `live` go through one recording session: the same bytes from a board give byte-identical
// journals, the block starts at the hello for both, and a board that did not reset on open is journaled right.
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openJournalWriter } from '../../host/journal/journal-writer.ts';
import { openDeviceLink, type DeviceLink } from '../../host/link/device-link.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { inThreadResultSource } from '../../host/pipeline/result-client.ts';
import { runRecorder } from '../../host/session/recorder.ts';
import { deviceFeed } from '../../host/tui/feeds/device-feed.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { DeviceLines } from '../link/helpers/device-lines.ts';
import { FakeBinding } from '../link/helpers/fake-binding.ts';
import { ManualTime, until } from '../link/helpers/manual-time.ts';

let dir: string;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-same-'))));
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const header = { start: new Date('2026-03-01T12:00:00.000Z'), source: 'test board', rigJson: '{"length_m":1,"flag_width_m":0.02}' };

/**
 * A board that keeps running when the port opens (no reset): it is mid-run, sends edges and heartbeats before
 * anyone asks, and says hello only when asked with `?`. Time is moved by hand, so both runs stamp alike.
 */
interface Script {
  readonly binding: FakeBinding;
  readonly time: ManualTime;
  play(link: DeviceLink): Promise<void>;
}
function nonResettingBoard(opts: { answers: boolean }): Script {
  const d = new DeviceLines(0x2b2b);
  const binding = new FakeBinding();
  const time = new ManualTime();
  // The board answers only once the script lets it (the link asks at 20 ms, then every 250 ms).
  let mayAnswer = false;
  let asked = 0;
  binding.add('/dev/ttyX', {}, (cmd) => (cmd === '?' && asked++ >= 0 && mayAnswer ? [d.hello()] : []));
  const linesRead = async (link: DeviceLink, n: number): Promise<void> => until(() => link.stats().lines >= n, `${n} lines read`);
  return {
    binding,
    time,
    async play(link) {
      await until(() => binding.isOpen('/dev/ttyX'), 'port open');
      const port = binding.port('/dev/ttyX');
      await time.advance(1);
      port.emit(`${d.edge(0x1000, 'f')}\n${d.beat(0x2000)}\n${d.edge(0x3000, 'r')}\n`);
      await linesRead(link, 3);
      // The first nudge (20 ms) goes unanswered, the second (270 ms) is answered.
      await time.advance(40);
      expect(asked).toBe(1);
      if (!opts.answers) return;
      mayAnswer = true;
      await time.advance(230);
      expect(asked).toBe(2);
      expect(link.hello()?.boot).toBe(0x2b2b);
      for (let k = 0; k < 4; k++) {
        await time.advance(1000);
        const n = link.stats().lines;
        port.emit(`${d.edge(0x10000 + k * 0x8000, 'f')}\n${d.edge(0x10400 + k * 0x8000, 'r')}\n${d.beat(0x11000 + k * 0x8000)}\n`);
        await linesRead(link, n + 3);
      }
      await time.advance(1000);
    },
  };
}

const linkFor = (s: Script): DeviceLink =>
  openDeviceLink({ port: '/dev/ttyX', binding: s.binding, now: s.time.nowUs, timers: s.time.timers, helloNudgeMs: 20, helloTimeoutMs: 2000, heartbeatMs: 60_000 });

async function viaRecord(path: string, answers = true): Promise<void> {
  const s = nonResettingBoard({ answers });
  const writer = openJournalWriter(path);
  const link = linkFor(s);
  const ac = new AbortController();
  const run = runRecorder({ link, writer, header, now: s.time.nowUs, timers: s.time.timers, pipeline: createRunPipeline(), createResults: () => inThreadResultSource(), statusEveryMs: 60_000, signal: ac.signal });
  await s.play(link);
  ac.abort();
  await run.catch(() => {});
  writer.close();
}

async function viaLive(path: string, answers = true): Promise<void> {
  const s = nonResettingBoard({ answers });
  const writer = openJournalWriter(path);
  const link = linkFor(s);
  const feed = deviceFeed({ link, writer, nowUs: s.time.nowUs, start: header.start, source: header.source, rigJson: header.rigJson, portLabel: '/dev/ttyX' });
  await s.play(link);
  await feed.close();
}

describe('one recording session for record and live', () => {
  it('the same bytes from a board give byte-identical journals', async () => {
    await viaRecord(join(dir, 'record.journal'));
    await viaLive(join(dir, 'live.journal'));
    const a = readFileSync(join(dir, 'record.journal'));
    expect(a.length).toBeGreaterThan(500);
    expect(readFileSync(join(dir, 'live.journal')).equals(a)).toBe(true);
  });

  it('a board that did not reset: its lines before the hello are kept as prehello notes, the hello comes first among data, and a clean stop is no disconnect', async () => {
    await viaRecord(join(dir, 'j'));
    const entries = readFileSync(join(dir, 'j'), 'latin1').split('\n').filter(Boolean).map(parseJournalLine);
    const body = entries.filter((e) => e.kind === 'data' || e.kind === 'annotation');
    expect(body.slice(0, 5).map((e) => (e.kind === 'annotation' ? e.word : e.line.slice(0, 2)))).toEqual(['prehello', 'prehello', 'prehello', 'connect', 'H ']);
    expect(body.at(-1)).toMatchObject({ kind: 'annotation', word: 'stop', text: 'shutdown' });
    // host_us never decreases (JOURNAL.md).
    const us = body.map((e) => (e.kind === 'data' || e.kind === 'annotation' ? e.hostUs : 0));
    expect(us).toEqual([...us].sort((x, y) => x - y));
    const r = analyzeEntries(entries);
    expect(r.counts.disconnects).toBe(0);
    expect(r.counts.crc_errors).toBe(0);
  });

  it('a board that never says hello leaves no journal, under record and under live alike', async () => {
    await viaRecord(join(dir, 'r.journal'), false);
    await viaLive(join(dir, 'l.journal'), false);
    expect(existsSync(join(dir, 'r.journal'))).toBe(false);
    expect(existsSync(join(dir, 'l.journal'))).toBe(false);
  });
});
