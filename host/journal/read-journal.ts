// Streaming reader of a finished journal file: yields parsed entries, checks the magic line first.
import { createReadStream } from 'node:fs';
import { constants } from 'node:fs';
import { access, stat } from 'node:fs/promises';
import { createInterface } from 'node:readline';
import { JOURNAL_MAGIC, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { UserError } from '../errors.ts';

/** Checks that `path` is a readable journal file; throws UserError with a one-line reason otherwise. */
export async function assertJournalFile(path: string): Promise<void> {
  let st;
  try {
    st = await stat(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new UserError(code === 'ENOENT' ? `no such journal: ${path}` : `cannot read ${path} (${code ?? 'error'})`);
  }
  if (st.isDirectory()) throw new UserError(`${path} is a folder, not a journal file`);
  try {
    await access(path, constants.R_OK);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new UserError(`cannot read journal ${path}: ${code === 'EACCES' || code === 'EPERM' ? 'permission denied (check its owner and mode)' : (code ?? 'error')}`);
  }
}

/**
 * Yields every entry of a journal file in order. Throws UserError if the file is missing or its first line
 * is not `#halfswing-journal 1`; a truncated last line (a crash mid-write) comes out as it is, to be rejected by the decoder.
 */
export async function* readJournalFile(path: string): AsyncGenerator<JournalEntry> {
  await assertJournalFile(path);
  const rl = createInterface({ input: createReadStream(path, { encoding: 'latin1' }), crlfDelay: Infinity });
  let first = true;
  for await (const line of rl) {
    if (first) {
      first = false;
      const e = parseJournalLine(line);
      if (e.kind !== 'magic') throw new UserError(`${path} is not a halfswing journal (its first line is not '${JOURNAL_MAGIC}')`);
      if (e.version !== 1) throw new UserError(`${path} is journal format ${e.version}; this version reads format 1`);
      yield e;
      continue;
    }
    yield parseJournalLine(line);
  }
  if (first) throw new UserError(`${path} is empty, not a halfswing journal`);
}

/**
 * Parses a journal line like `parseJournalLine`, with a fast path for data lines (`<host_us> <device line>`),
 * which are nearly all of a journal; any other line, or a data line the fast path is unsure of, goes to the
 * regular parser, so the entries are identical.
 */
export function parseJournalLineFast(raw: string): JournalEntry {
  const c0 = raw.charCodeAt(0);
  if (c0 < 48 || c0 > 57) return parseJournalLine(raw);
  let i = 0;
  let v = 0;
  for (; i < raw.length && i < 17; i++) {
    const c = raw.charCodeAt(i);
    if (c === 32) break;
    if (c < 48 || c > 57) return parseJournalLine(raw);
    v = v * 10 + (c - 48);
  }
  if (i === 0 || i > 16 || raw.charCodeAt(i) !== 32 || (c0 === 48 && i > 1)) return parseJournalLine(raw);
  const end = raw.charCodeAt(raw.length - 1) === 13 ? raw.length - 1 : raw.length;
  return { kind: 'data', hostUs: v, line: raw.slice(i + 1, end) };
}

/**
 * Yields the entries of a journal file in batches (one per chunk read), for batch analysis: far fewer async
 * steps than one per line. Same checks and errors as `readJournalFile`. With `input` (e.g. standard input) the
 * bytes come from that stream and `path` only names it in messages.
 */
export async function* readJournalBatches(path: string, input?: AsyncIterable<string | Buffer>): AsyncGenerator<JournalEntry[]> {
  if (!input) await assertJournalFile(path);
  let rest = '';
  let first = true;
  const handleFirst = (line: string): JournalEntry => {
    first = false;
    const e = parseJournalLine(line);
    if (e.kind !== 'magic') throw new UserError(`${path} is not a halfswing journal (its first line is not '${JOURNAL_MAGIC}')`);
    if (e.version !== 1) throw new UserError(`${path} is journal format ${e.version}; this version reads format 1`);
    return e;
  };
  for await (const chunk of input ?? createReadStream(path, { encoding: 'latin1', highWaterMark: 1 << 16 })) {
    const text = rest + (typeof chunk === 'string' ? chunk : chunk.toString('latin1'));
    const out: JournalEntry[] = [];
    let from = 0;
    for (let nl = text.indexOf('\n'); nl >= 0; nl = text.indexOf('\n', from)) {
      const line = text.slice(from, nl);
      out.push(first ? handleFirst(line) : parseJournalLineFast(line));
      from = nl + 1;
    }
    rest = text.slice(from);
    if (first && rest.length > 4096) handleFirst(rest.slice(0, 4096));
    if (out.length) yield out;
  }
  if (rest.length > 0) yield [first ? handleFirst(rest) : parseJournalLineFast(rest)];
  else if (first) throw new UserError(`${path} is empty, not a halfswing journal`);
}
