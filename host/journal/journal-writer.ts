// Append-only journal writer (format v1): every line reaches the OS at once, fsync at least once a second and on annotations.
import { closeSync, fstatSync, fsyncSync, ftruncateSync, openSync, readSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { dirname } from 'node:path';
import { journalAnnotation, journalData, journalHeader, JOURNAL_MAGIC, parseJournalLine, type AnnotationWord } from '../../protocol/journal.ts';
import { UserError } from '../errors.ts';

/** The file operations the writer uses; tests replace them to simulate a full disk or a read-only mount. */
export interface WriterIo {
  open(path: string, flags: string): number;
  write(fd: number, buf: Buffer, offset: number, length: number): number;
  fsync(fd: number): void;
  truncate(fd: number, length: number): void;
  close(fd: number): void;
}

const NODE_IO: WriterIo = {
  open: (p, f) => openSync(p, f),
  write: (fd, b, o, l) => writeSync(fd, b, o, l),
  fsync: (fd) => fsyncSync(fd),
  truncate: (fd, n) => ftruncateSync(fd, n),
  close: (fd) => closeSync(fd),
};

export interface JournalWriterOptions {
  /** Monotonic milliseconds, for the fsync pacing (defaults to performance.now). */
  readonly nowMs?: () => number;
  /** Longest time data may sit unsynced (ms). */
  readonly syncIntervalMs?: number;
  readonly io?: WriterIo;
}

/** The header of one recording block: a `#start` line opens a new host time base. */
export interface BlockHeader {
  readonly start: Date;
  readonly source: string;
  readonly rigJson?: string;
}

/** The writer stopped because the disk is full; the journal holds every line up to the last complete one. */
export class JournalFullError extends UserError {
  constructor(path: string, bytes: number) {
    super(`disk full: stopped writing ${path} at ${bytes} bytes; the journal is valid up to its last line. Free some space and run again to append`);
  }
}

export interface JournalWriter {
  readonly path: string;
  /** True when the file already held a journal and this run appends to it. */
  readonly appending: boolean;
  /** Writes a block header (`#start`, `#rig`, `#source`; the magic line first in a new file). */
  startBlock(h: BlockHeader): void;
  /** Appends a data line. Throws JournalFullError / UserError once writing is impossible. */
  data(hostUs: number, deviceLine: string): void;
  /** Appends an annotation and fsyncs. */
  annotate(hostUs: number, word: AnnotationWord, text?: string): void;
  /** fsyncs now if anything is unsynced. */
  sync(): void;
  /** Bytes in the file (all complete lines). */
  size(): number;
  /** fsyncs and closes. A file this writer created and never wrote a block to is removed. Idempotent. */
  close(): void;
}

function ioMessage(path: string, e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  switch (code) {
    case 'EROFS':
      return `cannot write journal ${path}: the file system is read-only; choose a writable --journal path`;
    case 'EACCES':
    case 'EPERM':
      return `cannot write journal ${path}: permission denied; choose a path you can write`;
    case 'ENOENT':
      return `cannot write journal ${path}: folder ${dirname(path)} does not exist`;
    case 'ENOTDIR':
      return `cannot write journal ${path}: ${dirname(path)} is not a folder`;
    case 'EISDIR':
      return `${path} is a folder, not a journal file`;
    case 'ENOSPC':
      return `cannot write journal ${path}: the disk is full`;
    default:
      return `cannot write journal ${path} (${code ?? (e as Error).message})`;
  }
}

/** Reads the first line (up to 200 bytes) and the last byte of an existing file. */
function inspect(path: string): { size: number; first: string; endsWithLf: boolean } | undefined {
  let st;
  try {
    st = statSync(path);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw new UserError(ioMessage(path, e));
  }
  if (st.isDirectory()) throw new UserError(`${path} is a folder, not a journal file`);
  if (st.size === 0) return { size: 0, first: '', endsWithLf: true };
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (e) {
    throw new UserError(ioMessage(path, e));
  }
  try {
    const head = Buffer.alloc(Math.min(200, st.size));
    readSync(fd, head, 0, head.length, 0);
    const last = Buffer.alloc(1);
    readSync(fd, last, 0, 1, st.size - 1);
    const text = head.toString('latin1');
    const lf = text.indexOf('\n');
    return { size: st.size, first: lf < 0 ? text : text.slice(0, lf), endsWithLf: last[0] === 0x0a };
  } finally {
    closeSync(fd);
  }
}

/**
 * Opens `path` for appending, before any port is opened, so a bad path fails first. An existing journal is
 * appended to (a new block); an empty file is treated as new; any other file is refused, never overwritten.
 */
export function openJournalWriter(path: string, opts: JournalWriterOptions = {}): JournalWriter {
  const existing = inspect(path);
  if (existing && existing.size > 0) {
    const e = parseJournalLine(existing.first);
    if (e.kind !== 'magic')
      throw new UserError(`${path} is not a halfswing journal (its first line is not '${JOURNAL_MAGIC}'); refusing to write to it: choose another --journal`);
    if (e.version !== 1) throw new UserError(`${path} is journal format ${e.version}; this version writes format 1: choose another --journal`);
  }
  const io = opts.io ?? NODE_IO;
  let fd: number;
  try {
    fd = io.open(path, 'a');
  } catch (e) {
    throw new UserError(ioMessage(path, e));
  }
  return new Writer(path, fd, io, existing, opts);
}

class Writer implements JournalWriter {
  readonly appending: boolean;
  private bytes: number;
  private readonly created: boolean;
  private blocks = 0;
  private dirty = false;
  private lastSync: number;
  private failure: Error | undefined;
  private open = true;
  private needsLf: boolean;
  private readonly nowMs: () => number;
  private readonly syncMs: number;
  private readonly ticker: NodeJS.Timeout;

  constructor(
    readonly path: string,
    private readonly fd: number,
    private readonly io: WriterIo,
    existing: { size: number; endsWithLf: boolean } | undefined,
    opts: JournalWriterOptions,
  ) {
    this.appending = existing !== undefined && existing.size > 0;
    this.created = existing === undefined;
    this.bytes = existing?.size ?? 0;
    // A crash mid-line left a partial last line: end it, so it reads as one rejected line and ours stay whole.
    this.needsLf = existing !== undefined && !existing.endsWithLf;
    this.nowMs = opts.nowMs ?? (() => performance.now());
    this.syncMs = opts.syncIntervalMs ?? 1000;
    this.lastSync = this.nowMs();
    // Lines that stop arriving must still reach the disk within the interval.
    this.ticker = setInterval(() => {
      try {
        this.syncIfDue();
      } catch {
        // Kept in `failure`; the next append reports it to the caller.
      }
    }, this.syncMs);
    this.ticker.unref();
  }

  startBlock(h: BlockHeader): void {
    const lines = journalHeader({ ...h, withMagic: this.bytes === 0 && !this.appending });
    this.blocks++;
    this.append(`${this.needsLf ? '\n' : ''}${lines.join('\n')}\n`, 'utf8');
    this.needsLf = false;
    this.syncNow();
  }

  data(hostUs: number, deviceLine: string): void {
    this.append(`${journalData(hostUs, deviceLine)}\n`, 'latin1');
    this.syncIfDue();
  }

  annotate(hostUs: number, word: AnnotationWord, text = ''): void {
    this.append(`${journalAnnotation(hostUs, word, text)}\n`, 'utf8');
    this.syncNow();
  }

  sync(): void {
    if (this.dirty) this.syncNow();
  }

  size(): number {
    return this.bytes;
  }

  close(): void {
    if (!this.open) return;
    this.open = false;
    clearInterval(this.ticker);
    try {
      if (this.dirty && !this.failure) this.io.fsync(this.fd);
    } catch {
      // Reported by the last write already, or nothing more can be done at close.
    }
    this.io.close(this.fd);
    if (this.created && this.blocks === 0) {
      try {
        if (fstatOrZero(this.path) === 0) unlinkSync(this.path);
      } catch {
        // Leave it: an empty file is harmless and reads as "empty journal".
      }
    }
  }

  /**
   * Device lines go out byte for byte (latin1: one char, one byte, as the link read them); header and
   * annotation text is the host's own, written as UTF-8 (JOURNAL.md, "Bytes").
   */
  private append(text: string, encoding: 'latin1' | 'utf8'): void {
    if (this.failure) throw this.failure;
    if (!this.open) throw new Error(`journal ${this.path} is closed`);
    if (this.blocks === 0) throw new Error('startBlock() must come before data');
    const buf = Buffer.from(text, encoding);
    let off = 0;
    try {
      while (off < buf.length) off += this.io.write(this.fd, buf, off, buf.length - off);
    } catch (e) {
      this.failure =
        (e as NodeJS.ErrnoException).code === 'ENOSPC' ? new JournalFullError(this.path, this.bytes) : new UserError(ioMessage(this.path, e));
      // Part of the line may have reached the file: cut it off, so the journal ends on its last whole line.
      try {
        if (off > 0) this.io.truncate(this.fd, this.bytes);
        this.io.fsync(this.fd);
      } catch {
        // Nothing more can be saved; a reader rejects a partial last line as truncated.
      }
      throw this.failure;
    }
    this.bytes += buf.length;
    this.dirty = true;
  }

  private syncIfDue(): void {
    if (this.dirty && !this.failure && this.nowMs() - this.lastSync >= this.syncMs) this.syncNow();
  }

  private syncNow(): void {
    try {
      this.io.fsync(this.fd);
    } catch (e) {
      this.failure ??= new UserError(ioMessage(this.path, e));
      throw this.failure;
    }
    this.dirty = false;
    this.lastSync = this.nowMs();
  }
}

function fstatOrZero(path: string): number {
  const fd = openSync(path, 'r');
  try {
    return fstatSync(fd).size;
  } finally {
    closeSync(fd);
  }
}
