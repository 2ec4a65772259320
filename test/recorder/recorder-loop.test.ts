// The recording loop in-process, on a fake board: nothing written before the hello, a full disk stops it cleanly.
import { closeSync, existsSync, fsyncSync, ftruncateSync, mkdtempSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JournalFullError, openJournalWriter, type WriterIo } from '../../host/journal/journal-writer.ts';
import { runRecorder } from '../../host/session/recorder.ts';
import { openDeviceLink } from '../../host/link/device-link.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { inThreadResultSource } from '../../host/pipeline/result-client.ts';
import { DeviceLines } from '../link/helpers/device-lines.ts';
import { FakeBinding } from '../link/helpers/fake-binding.ts';
import { ManualTime, settle } from '../link/helpers/manual-time.ts';

let dir: string;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-loop-'))));
afterEach(() => rmSync(dir, { recursive: true, force: true }));

/** Real file operations, but writes fail with ENOSPC once `budget` bytes are written. */
function fillingDisk(budget: number): WriterIo {
  let written = 0;
  return {
    open: (p, f) => openSync(p, f),
    write: (fd, b, o, l) => {
      if (written >= budget) throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
      const n = writeSync(fd, b, o, Math.min(l, budget - written));
      written += n;
      return n;
    },
    fsync: (fd) => fsyncSync(fd),
    truncate: (fd, n) => ftruncateSync(fd, n),
    close: (fd) => closeSync(fd),
  };
}

const header = { start: new Date('2026-03-01T12:00:00.000Z'), source: 'test' };

describe('runRecorder', () => {
  it('a board that never says hello: the link error is thrown and no journal is left', async () => {
    const b = new FakeBinding();
    b.add('/dev/ttyX');
    const m = new ManualTime();
    const path = join(dir, 'j');
    const writer = openJournalWriter(path);
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now: m.nowUs, timers: m.timers, helloTimeoutMs: 100 });
    const statuses: string[] = [];
    const run = runRecorder({ link, writer, header, now: m.nowUs, timers: m.timers, statusEveryMs: 40, onStatus: (s) => statuses.push(s.state), signal: new AbortController().signal });
    const failed = expect(run).rejects.toThrow(/no data from \/dev\/ttyX in 0\.1 s/);
    await m.advance(100);
    await failed;
    writer.close();
    // Two statuses while waiting (40 and 80 ms), none after; every timer stopped.
    expect(statuses).toEqual(['waiting-hello', 'waiting-hello']);
    expect(m.count).toBe(0);
    expect(existsSync(path)).toBe(false);
  });

  it('a full disk stops recording with JournalFullError, closes the port, and leaves whole lines only', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const m = new ManualTime();
    const path = join(dir, 'j');
    const writer = openJournalWriter(path, { io: fillingDisk(2000) });
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now: m.nowUs, timers: m.timers, helloNudgeMs: 5, heartbeatMs: 60_000 });
    const run = runRecorder({ link, writer, header, now: m.nowUs, timers: m.timers, pipeline: createRunPipeline(), createResults: () => inThreadResultSource(), statusEveryMs: 1000, signal: new AbortController().signal });
    await m.advance(5);
    await link.ready;
    for (let i = 0; i < 200 && b.isOpen('/dev/ttyX'); i++) {
      b.port('/dev/ttyX').emit(`${d.edge(1000 + i * 5000, i % 2 ? 'r' : 'f')}\n`);
      await settle(2);
    }
    const summary = await run;
    writer.close();
    expect(summary.error).toBeInstanceOf(JournalFullError);
    expect(b.isOpen('/dev/ttyX')).toBe(false);
    const text = readFileSync(path, 'latin1');
    expect(text.endsWith('\n')).toBe(true);
    expect(text.length).toBeLessThanOrEqual(2000);
    expect(text.split('\n').filter((l) => /^\d+ E /.test(l)).every((l) => /^\d+ E [0-9a-f]+ 0 [rf] [0-9a-f]+ \*[0-9a-f]{2}$/.test(l))).toBe(true);
    expect(summary.status.state).toBe('stopped');
  });

  it('statuses come on the injected timer; a failing result worker is dropped with one line and g is computed in-thread', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const m = new ManualTime();
    const writer = openJournalWriter(join(dir, 'j'));
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now: m.nowUs, timers: m.timers, helloNudgeMs: 5, heartbeatMs: 60_000 });
    const p = createRunPipeline();
    let inThread = 0;
    const pipeline = { ...p, result: (o?: { rows?: boolean }) => (inThread++, p.result(o)) };
    const dead = { ...inThreadResultSource(), inThread: false, result: () => Promise.reject(new Error('worker died')) };
    const warned: string[] = [];
    const states: string[] = [];
    const ac = new AbortController();
    const run = runRecorder({ link, writer, header, now: m.nowUs, timers: m.timers, pipeline, createResults: () => dead, warn: (l) => warned.push(l), statusEveryMs: 100, onStatus: (s) => states.push(s.state), signal: ac.signal });
    await m.advance(99);
    expect(states).toEqual([]);
    await m.advance(1);
    expect(states).toEqual(['connected']);
    expect(inThread).toBe(1);
    await m.advance(300);
    expect(states).toHaveLength(4);
    ac.abort();
    const summary = await run;
    writer.close();
    expect(warned).toEqual(['full analysis now runs on the main thread (result worker failed: worker died)']);
    expect(summary.status.state).toBe('stopped');
    // One g per status interval, one more for the last status.
    expect(inThread).toBe(5);
  });
});
