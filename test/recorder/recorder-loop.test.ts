// The recording loop in-process, on a fake board: nothing written before the hello, a full disk stops it cleanly.
import { closeSync, existsSync, fsyncSync, ftruncateSync, mkdtempSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JournalFullError, openJournalWriter, type WriterIo } from '../../host/journal/journal-writer.ts';
import { runRecorder } from '../../host/session/recorder.ts';
import { openDeviceLink } from '../../host/link/device-link.ts';
import { monotonicClock } from '../../host/link/monotonic-clock.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { DeviceLines } from '../link/helpers/device-lines.ts';
import { FakeBinding } from '../link/helpers/fake-binding.ts';

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
    const now = monotonicClock();
    const path = join(dir, 'j');
    const writer = openJournalWriter(path);
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now, helloTimeoutMs: 100 });
    await expect(runRecorder({ link, writer, header, now, statusEveryMs: 1000, signal: new AbortController().signal })).rejects.toThrow(/no data from \/dev\/ttyX/);
    writer.close();
    expect(existsSync(path)).toBe(false);
  });

  it('a full disk stops recording with JournalFullError, closes the port, and leaves whole lines only', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const now = monotonicClock();
    const path = join(dir, 'j');
    const writer = openJournalWriter(path, { io: fillingDisk(2000) });
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now, helloNudgeMs: 5, heartbeatMs: 60_000 });
    const run = runRecorder({ link, writer, header, now, pipeline: createRunPipeline(), statusEveryMs: 1000, signal: new AbortController().signal });
    await link.ready;
    for (let i = 0; i < 200 && b.isOpen('/dev/ttyX'); i++) {
      b.port('/dev/ttyX').emit(`${d.edge(1000 + i * 5000, i % 2 ? 'r' : 'f')}\n`);
      await new Promise((r) => setTimeout(r, 1));
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
});
