// The one rig-file loader of every command: the path is taken from the command's working directory.
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { assumedNote, parseRig, type AnyRig } from '../../protocol/rig.ts';
import { UserError } from '../errors.ts';

/**
 * Reads and validates a rig file, resolving a relative `path` against `cwd`. A bad file is a UserError of
 * one line that names the file and the key; uncertainties the file leaves out are told through `note`.
 */
export function loadRigFile(path: string, cwd: string, note: (line: string) => void): AnyRig {
  let text: string;
  try {
    text = readFileSync(resolve(cwd, path), 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new UserError(code === 'ENOENT' ? `no such rig file: ${path}` : `cannot read rig file ${path} (${code ?? 'error'})`);
  }
  const r = parseRig(text);
  if (!r.ok) throw new UserError(`rig file ${path}: ${r.error}`);
  const n = assumedNote(r.rig);
  if (n) note(`halfswing: note: ${n}`);
  return r.rig;
}
