// Follows a journal while the recorder writes it (tail -f), or replays a finished one paced by its host time.
import { open, stat, type FileHandle } from 'node:fs/promises';
import { JOURNAL_MAGIC, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { UserError } from '../errors.ts';

export interface FollowOptions {
  /** Keep waiting at the end of the file for more lines (default true). False: stop at the end (replay). */
  readonly follow?: boolean;
  /** Replay pacing: host time runs `speed` times faster than real time. Omitted, 0 or Infinity: no pacing. */
  readonly speed?: number;
  /** How often to look for new data at the end of the file (ms). */
  readonly pollMs?: number;
  /** Wait for the file to appear instead of failing (a viewer started before the recorder). */
  readonly waitForFile?: boolean;
  readonly signal?: AbortSignal;
  /** Called when the file was truncated or replaced and is read again from its start. */
  readonly onReset?: (why: 'truncated' | 'replaced') => void;
  /** Injected for tests: sleeping and a monotonic ms clock, used by polling and pacing. */
  readonly sleep?: (ms: number) => Promise<void>;
  readonly nowMs?: () => number;
}

const CHUNK = 64 * 1024;

function defaultSleep(signal: AbortSignal | undefined): (ms: number) => Promise<void> {
  return (ms) =>
    new Promise((resolve) => {
      const t = setTimeout(done, ms);
      function done(): void {
        clearTimeout(t);
        signal?.removeEventListener('abort', done);
        resolve();
      }
      signal?.addEventListener('abort', done, { once: true });
    });
}

async function openWhenThere(path: string, opts: FollowOptions, sleep: (ms: number) => Promise<void>): Promise<FileHandle | undefined> {
  for (;;) {
    try {
      return await open(path, 'r');
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === 'ENOENT' && opts.waitForFile && !opts.signal?.aborted) {
        await sleep(opts.pollMs ?? 100);
        if (opts.signal?.aborted) return undefined;
        continue;
      }
      if (code === 'ENOENT') throw new UserError(`no such journal: ${path}`);
      if (code === 'EISDIR') throw new UserError(`${path} is a folder, not a journal file`);
      throw new UserError(`cannot read ${path} (${code ?? 'error'})`);
    }
  }
}

/**
 * Yields the journal's entries in order: complete lines only while following (a partial last line is held
 * back until its LF arrives); in replay mode (`follow: false`) an unterminated last line comes out as it is,
 * as readJournalFile does. Throws UserError when the first line is not the journal magic.
 * End it with `signal` or by leaving the for-await loop.
 */
export async function* followJournal(path: string, opts: FollowOptions = {}): AsyncGenerator<JournalEntry> {
  const follow = opts.follow ?? true;
  const sleep = opts.sleep ?? defaultSleep(opts.signal);
  const nowMs = opts.nowMs ?? (() => performance.now());
  const pollMs = opts.pollMs ?? 100;
  const pace = pacer(opts.speed, sleep, nowMs);
  let fh = await openWhenThere(path, opts, sleep);
  if (!fh) return;
  let pos = 0;
  let pending = '';
  let first = true;
  const buf = Buffer.alloc(CHUNK);
  const checkFirst = (line: string): JournalEntry => {
    const e = parseJournalLine(line);
    if (e.kind !== 'magic') throw new UserError(`${path} is not a halfswing journal (its first line is not '${JOURNAL_MAGIC}')`);
    if (e.version !== 1) throw new UserError(`${path} is journal format ${e.version}; this version reads format 1`);
    return e;
  };
  try {
    while (!opts.signal?.aborted) {
      const { bytesRead } = await fh.read(buf, 0, CHUNK, pos);
      if (bytesRead > 0) {
        pos += bytesRead;
        pending += buf.toString('latin1', 0, bytesRead);
        let lf: number;
        while ((lf = pending.indexOf('\n')) >= 0) {
          const line = pending.slice(0, lf);
          pending = pending.slice(lf + 1);
          const e = first ? checkFirst(line) : parseJournalLine(line);
          first = false;
          await pace(e);
          if (opts.signal?.aborted) return;
          yield e;
        }
        continue;
      }
      if (!follow) {
        if (pending.length > 0) {
          const e = first ? checkFirst(pending) : parseJournalLine(pending);
          await pace(e);
          yield e;
        } else if (first) throw new UserError(`${path} is empty, not a halfswing journal`);
        return;
      }
      const reset = await changed(path, fh, pos);
      if (reset) {
        await fh.close();
        fh = await openWhenThere(path, { ...opts, waitForFile: true }, sleep);
        if (!fh) return;
        pos = 0;
        pending = '';
        first = true;
        opts.onReset?.(reset);
        continue;
      }
      await sleep(pollMs);
    }
  } finally {
    await fh?.close().catch(() => {});
  }
}

/** Whether the file at `path` is no longer what `fh` reads: replaced (new inode, or gone) or truncated below `pos`. */
async function changed(path: string, fh: FileHandle, pos: number): Promise<'truncated' | 'replaced' | undefined> {
  const mine = await fh.stat();
  let now;
  try {
    now = await stat(path);
  } catch {
    // Gone (rotated away): wait for the new one.
    return 'replaced';
  }
  if (now.ino !== mine.ino || now.dev !== mine.dev) return 'replaced';
  if (mine.size < pos) return 'truncated';
  return undefined;
}

/**
 * Sleeps before each timed entry so that host time advances `speed` times faster than the clock. A new
 * `#start` block continues from the previous block's last time, so replay never jumps back.
 */
function pacer(speed: number | undefined, sleep: (ms: number) => Promise<void>, nowMs: () => number): (e: JournalEntry) => Promise<void> {
  if (!speed || !Number.isFinite(speed) || speed <= 0) return async () => {};
  let offsetUs = 0;
  let lastUs = 0;
  let t0Us: number | undefined;
  let wall0 = 0;
  return async (e) => {
    if (e.kind === 'start') {
      offsetUs = lastUs;
      return;
    }
    if (e.kind !== 'data' && e.kind !== 'annotation') return;
    const t = offsetUs + e.hostUs;
    lastUs = Math.max(lastUs, t);
    if (t0Us === undefined) {
      t0Us = t;
      wall0 = nowMs();
      return;
    }
    const wait = wall0 + (t - t0Us) / 1000 / speed - nowMs();
    if (wait > 0) await sleep(wait);
  };
}
