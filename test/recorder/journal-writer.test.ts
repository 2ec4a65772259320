import { closeSync, fsyncSync, mkdtempSync, openSync, readFileSync, rmSync, existsSync, writeFileSync, writeSync, ftruncateSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { JournalFullError, openJournalWriter, type WriterIo } from '../../host/journal/journal-writer.ts';
import { readJournalFile } from '../../host/journal/read-journal.ts';
import type { JournalEntry } from '../../protocol/journal.ts';

let dir: string;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-writer-'))));
afterEach(() => rmSync(dir, { recursive: true, force: true }));

async function entries(path: string): Promise<JournalEntry[]> {
  const out: JournalEntry[] = [];
  for await (const e of readJournalFile(path)) out.push(e);
  return out;
}

const header = { start: new Date('2026-03-01T12:00:00.000Z'), source: 'serial /dev/ttyACM0 250000', rigJson: '{"length_m":1}' };

/** Counts fsyncs and can fail writes after a byte budget, like a disk filling up. */
function countingIo(budget = Infinity): WriterIo & { fsyncs: number; written: number } {
  const io = {
    fsyncs: 0,
    written: 0,
    open: (p: string, f: string) => openSync(p, f),
    write: (fd: number, b: Buffer, o: number, l: number) => {
      const room = budget - io.written;
      if (room <= 0) throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
      const n = writeSync(fd, b, o, Math.min(l, room));
      io.written += n;
      return n;
    },
    fsync: (fd: number) => {
      io.fsyncs++;
      fsyncSync(fd);
    },
    truncate: (fd: number, n: number) => ftruncateSync(fd, n),
    close: (fd: number) => closeSync(fd),
  };
  return io;
}

describe('journal writer', () => {
  it('writes a new journal that the reader reads back line for line', async () => {
    const p = join(dir, 'a.journal');
    const w = openJournalWriter(p);
    w.startBlock(header);
    w.data(10, 'T 0 0 0 1 *00');
    w.annotate(20, 'note', 'hello');
    expect(w.size()).toBe(readFileSync(p).length);
    w.close();
    const es = await entries(p);
    expect(es.map((e) => e.kind)).toEqual(['magic', 'start', 'rig', 'source', 'data', 'annotation']);
    expect(es[4]).toEqual({ kind: 'data', hostUs: 10, line: 'T 0 0 0 1 *00' });
  });

  it('a re-run appends a new #start block without a second magic line, never overwriting', async () => {
    const p = join(dir, 'a.journal');
    const w1 = openJournalWriter(p);
    w1.startBlock(header);
    w1.data(1, 'x');
    w1.close();
    const w2 = openJournalWriter(p);
    expect(w2.appending).toBe(true);
    w2.startBlock({ ...header, start: new Date('2026-03-02T12:00:00.000Z') });
    w2.data(1, 'y');
    w2.close();
    const kinds = (await entries(p)).map((e) => e.kind);
    expect(kinds.filter((k) => k === 'magic')).toHaveLength(1);
    expect(kinds.filter((k) => k === 'start')).toHaveLength(2);
    expect((await entries(p)).flatMap((e) => (e.kind === 'data' ? [e.line] : []))).toEqual(['x', 'y']);
  });

  it('ends a crash-truncated last line before appending, so the old tail and the new block stay apart', async () => {
    const p = join(dir, 'a.journal');
    writeFileSync(p, '#halfswing-journal 1\n#start 2026-03-01T12:00:00.000Z\n#source x\n5 E 1 0 f 3d');
    const w = openJournalWriter(p);
    w.startBlock(header);
    w.close();
    const es = await entries(p);
    expect(es[3]).toEqual({ kind: 'data', hostUs: 5, line: 'E 1 0 f 3d' });
    expect(es[4]!.kind).toBe('start');
  });

  it('refuses a file of another format and leaves it untouched', () => {
    const p = join(dir, 'notes.txt');
    writeFileSync(p, 'my lab notes\n');
    expect(() => openJournalWriter(p)).toThrow(/not a halfswing journal .*refusing/);
    writeFileSync(join(dir, 'v2'), '#halfswing-journal 2\n');
    expect(() => openJournalWriter(join(dir, 'v2'))).toThrow(/journal format 2/);
    expect(readFileSync(p, 'utf8')).toBe('my lab notes\n');
  });

  it('a path it cannot write fails with one line before anything else happens', () => {
    expect(() => openJournalWriter(join(dir, 'no-such-folder', 'a.journal'))).toThrow(/folder .*no-such-folder does not exist/);
    writeFileSync(join(dir, 'file'), '');
    expect(() => openJournalWriter(join(dir, 'file', 'a.journal'))).toThrow(/is not a folder/);
    expect(() => openJournalWriter(dir)).toThrow(/is a folder/);
    // A read-only mount cannot be made without privileges here: the open error is injected (EROFS, EACCES).
    for (const [code, msg] of [['EROFS', /read-only/], ['EACCES', /permission denied/]] as const) {
      const io = { ...countingIo(), open: () => { throw Object.assign(new Error(code), { code }); } };
      expect(() => openJournalWriter(join(dir, `${code}.journal`), { io })).toThrow(msg);
    }
  });

  it('removes a file it created when no block was ever written (the port never opened)', () => {
    const p = join(dir, 'unused.journal');
    openJournalWriter(p).close();
    expect(existsSync(p)).toBe(false);
  });

  it('fsyncs on every annotation, and data at least once per interval of the injected clock', () => {
    let ms = 0;
    const io = countingIo();
    const w = openJournalWriter(join(dir, 's.journal'), { io, nowMs: () => ms, syncIntervalMs: 1000 });
    w.startBlock(header);
    const afterHeader = io.fsyncs;
    for (let i = 0; i < 100; i++) w.data(i, 'x');
    expect(io.fsyncs).toBe(afterHeader);
    ms = 1000;
    w.data(101, 'x');
    expect(io.fsyncs).toBe(afterHeader + 1);
    w.annotate(102, 'disconnect', 'unplugged');
    expect(io.fsyncs).toBe(afterHeader + 2);
    w.close();
  });

  it('on a full disk stops with a clear message and leaves the journal valid up to its last whole line', async () => {
    const p = join(dir, 'full.journal');
    const io = countingIo(300);
    const w = openJournalWriter(p, { io });
    w.startBlock(header);
    let err: unknown;
    let written = 0;
    try {
      for (let i = 0; i < 1000; i++) {
        w.data(i, `E ${i.toString(16)} 0 f ${(i * 1000).toString(16)} *00`);
        written++;
      }
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(JournalFullError);
    expect((err as Error).message).toMatch(/disk full: stopped writing .* valid up to its last line/);
    expect(() => w.data(0, 'again')).toThrow(JournalFullError);
    w.close();
    const text = readFileSync(p, 'latin1');
    expect(text.endsWith('\n')).toBe(true);
    const data = (await entries(p)).filter((e) => e.kind === 'data');
    expect(data).toHaveLength(written);
    expect(data.every((e) => e.kind === 'data' && /^E [0-9a-f]+ 0 f [0-9a-f]+ \*00$/.test(e.line))).toBe(true);
  });

  it('writes device bytes unchanged (latin1) and the host text as UTF-8', () => {
    const p = join(dir, 'bytes.journal');
    const w = openJournalWriter(p);
    w.startBlock({ ...header, rigJson: '{"name":"Büro"}' });
    w.data(1, 'E 1 0 f \xff\x80 *00');
    w.annotate(2, 'note', 'gate moved 1 mm → window, 20 °C');
    w.close();
    const bytes = readFileSync(p);
    expect(bytes.includes(Buffer.from('{"name":"Büro"}', 'utf8'))).toBe(true);
    expect(bytes.includes(Buffer.from([0x45, 0x20, 0x31, 0x20, 0x30, 0x20, 0x66, 0x20, 0xff, 0x80]))).toBe(true);
    expect(bytes.includes(Buffer.from('→ window, 20 °C', 'utf8'))).toBe(true);
  });
});
