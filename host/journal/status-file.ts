// Writes the recorder's machine-readable status file atomically (temp file, fsync, rename), for lab monitoring.
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { UserError } from '../errors.ts';

/** Replaces `path` with `value` as JSON, so a reader never sees a half-written file. */
export function writeStatusFile(path: string, value: unknown): void {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    const fd = openSync(tmp, 'w');
    try {
      writeSync(fd, `${JSON.stringify(value, null, 2)}\n`);
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
    renameSync(tmp, path);
    syncFolder(dirname(path));
  } catch (e) {
    rmSync(tmp, { force: true });
    throw new UserError(`cannot write status file ${path} (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

/** fsyncs a folder so a rename in it survives a power cut (best effort: not every system allows it). */
function syncFolder(dir: string): void {
  try {
    const fd = openSync(dir, 'r');
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
  } catch {
    // Some file systems refuse fsync on a folder; the rename itself is still atomic.
  }
}
