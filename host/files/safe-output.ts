// Output safety for every command that writes files: no output lands on one of the command's inputs or on an
// existing journal (compared by device + inode, so symlinks and hard links count), and every output is written
// whole: into a temporary file in the same folder, renamed over the target only when complete.
import { randomBytes } from 'node:crypto';
import { constants, fstat, type Stats } from 'node:fs';
import { access, open, rename, rm, stat } from 'node:fs/promises';
import { basename, dirname } from 'node:path';
import { UserError } from '../errors.ts';

/** A refusal or a failed write: one line for the user. */
export class OutputError extends UserError {
  override readonly name = 'OutputError';
}

/** An output file a command is about to write, and how the user named it (for the message). */
export interface PlannedOutput {
  readonly path: string;
  /** E.g. `--csv`; shown in the refusal. */
  readonly flag: string;
  /** Refuse any existing file here unless `force` (e.g. `sim --journal`); otherwise only inputs and journals are refused. */
  readonly mustBeNew?: boolean;
}

/** An input of the command: a file path, or an open descriptor (standard input redirected from a file). */
export type InputRef = { readonly path: string } | { readonly fd: number; readonly label: string };

/** The first bytes of a journal file, whatever its format version. */
const JOURNAL_PREFIX = '#halfswing-journal';
/** A journal written by the simulator says so on its `#source` line; it can be made again from that line. */
const SIMULATED_SOURCE = /^#source halfswing sim /m;

const code = (e: unknown): string => (e as NodeJS.ErrnoException).code ?? 'error';
const sameFile = (a: Stats, b: Stats): boolean => a.dev === b.dev && a.ino === b.ino;

async function statOrNull(p: string): Promise<Stats | null> {
  try {
    return await stat(p);
  } catch (e) {
    if (code(e) === 'ENOENT') return null;
    throw new OutputError(`cannot check ${p} (${code(e)})`);
  }
}

async function inputStats(inputs: readonly InputRef[]): Promise<{ label: string; st: Stats }[]> {
  const out: { label: string; st: Stats }[] = [];
  for (const i of inputs) {
    if ('fd' in i) {
      const st = await new Promise<Stats | null>((res) => fstat(i.fd, (e, s) => res(e ? null : s)));
      if (st?.isFile()) out.push({ label: i.label, st });
    } else {
      const st = await statOrNull(i.path).catch(() => null);
      if (st) out.push({ label: i.path, st });
    }
  }
  return out;
}

/** The first few hundred bytes of a file ('' if unreadable). */
async function head(p: string): Promise<string> {
  try {
    const fh = await open(p, 'r');
    try {
      const buf = Buffer.alloc(512);
      const { bytesRead } = await fh.read(buf, 0, buf.length, 0);
      return buf.subarray(0, bytesRead).toString('latin1');
    } finally {
      await fh.close();
    }
  } catch {
    return '';
  }
}

/** Why `o` may not be written, or null. */
async function refusal(o: PlannedOutput, st: Stats | null, inputs: { label: string; st: Stats }[], force: boolean): Promise<string | null> {
  if (st === null) return folderProblem(o);
  if (st.isDirectory()) return `${o.flag} ${o.path} is a folder; give a file name`;
  const input = inputs.find((i) => sameFile(i.st, st));
  if (input) return `${o.flag} ${o.path} is the input ${input.label} (same file); refusing to write over it: choose another name`;
  const text = await head(o.path);
  const journal = text.startsWith(JOURNAL_PREFIX);
  // A simulated journal can be made again from its #source line, so --force may replace it; a recording cannot.
  const replaceable = o.mustBeNew === true && (!journal || SIMULATED_SOURCE.test(text));
  if (replaceable && !force) return `${o.flag} ${o.path} already exists; choose another name, or add --force to replace it`;
  if (journal && !replaceable) return `${o.flag} ${o.path} is an existing journal; refusing to write over it: choose another name`;
  return null;
}

async function folderProblem(o: PlannedOutput): Promise<string | null> {
  const dir = dirname(o.path);
  const st = await statOrNull(dir);
  if (st === null) return `cannot write ${o.flag} ${o.path}: folder ${dir} does not exist`;
  if (!st.isDirectory()) return `cannot write ${o.flag} ${o.path}: ${dir} is not a folder`;
  try {
    await access(dir, constants.W_OK);
  } catch {
    return `cannot write ${o.flag} ${o.path}: no permission to write in folder ${dir}`;
  }
  return null;
}

/**
 * Checks every planned output before anything is written: throws OutputError (one line) when an output is one of
 * the inputs, an existing journal, an existing file where a new one is required (`mustBeNew`; with `force` such a
 * file may be replaced, and so may a simulated journal there, never a recorded one), the same file as another
 * output, a folder, or in a folder that cannot take it.
 */
export async function guardOutputs(outputs: readonly PlannedOutput[], inputs: readonly InputRef[], opts: { force?: boolean } = {}): Promise<void> {
  const ins = await inputStats(inputs);
  const seen: { flag: string; st: Stats | null; path: string }[] = [];
  for (const o of outputs) {
    const st = await statOrNull(o.path);
    const why = await refusal(o, st, ins, opts.force ?? false);
    if (why) throw new OutputError(why, 1);
    const twin = seen.find((s) => (s.st && st ? sameFile(s.st, st) : s.path === o.path));
    if (twin) throw new OutputError(`${twin.flag} and ${o.flag} name the same file ${o.path}; give each its own name`, 2);
    seen.push({ flag: o.flag, st, path: o.path });
  }
}

/** A temporary name in the target's folder (so the rename stays on one file system). */
export function tempPathFor(path: string): string {
  return `${dirname(path)}/.${basename(path)}.tmp-${process.pid}-${randomBytes(4).toString('hex')}`;
}

/** Writes each file from its chunks to a temporary name, then renames them all; on any failure none is left. */
export async function writeWhole(files: readonly { path: string; chunks: Iterable<string> | AsyncIterable<string> }[]): Promise<void> {
  const temps = files.map((f) => ({ ...f, tmp: tempPathFor(f.path) }));
  try {
    for (const f of temps) {
      const fh = await open(f.tmp, 'wx');
      try {
        for await (const c of f.chunks) await fh.write(c);
      } finally {
        await fh.close();
      }
    }
    for (const f of temps) await rename(f.tmp, f.path);
  } catch (e) {
    await Promise.all(temps.map((f) => rm(f.tmp, { force: true })));
    if (e instanceof OutputError) throw e;
    throw new OutputError(`cannot write ${temps.map((f) => f.path).join(', ')} (${code(e)})`);
  }
}
