// Streaming reader of a finished journal file: yields parsed entries, checks the magic line first.
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { createInterface } from 'node:readline';
import { JOURNAL_MAGIC, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { UserError } from '../cli/errors.ts';

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
