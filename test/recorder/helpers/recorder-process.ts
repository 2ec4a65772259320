// Runs `halfswing record` as a child process with stdin closed, as a service manager would.
import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { readJournalFile } from '../../../host/journal/read-journal.ts';
import type { JournalEntry } from '../../../protocol/journal.ts';

const BIN = fileURLToPath(new URL('../../../bin/halfswing.js', import.meta.url));

export interface RecorderChild {
  readonly proc: ChildProcess;
  stderr(): string;
  /** Resolves with the exit code (or signal name). */
  exited: Promise<number | string>;
  peakRssKb(): number | undefined;
}

/**
 * Starts the recorder with no terminal: stdin is /dev/null, or with `closedStdin` not open at all (the shell's
 * `<&-`), as some service managers leave it.
 */
export function startRecorder(args: string[], opts: { closedStdin?: boolean } = {}): RecorderChild {
  const argv = [BIN, 'record', ...args];
  const proc = opts.closedStdin
    ? spawn('sh', ['-c', 'exec "$0" "$@" <&-', process.execPath, ...argv], { stdio: ['ignore', 'pipe', 'pipe'] })
    : spawn(process.execPath, argv, { stdio: ['ignore', 'pipe', 'pipe'] });
  let err = '';
  proc.stderr!.setEncoding('utf8');
  proc.stderr!.on('data', (d: string) => (err += d));
  proc.stdout!.resume();
  let peak: number | undefined;
  const sample = setInterval(() => {
    try {
      const m = /VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${proc.pid}/status`, 'utf8'));
      if (m) peak = Number(m[1]);
    } catch {
      // gone
    }
  }, 100);
  const exited = once(proc, 'exit').then(([code, sig]) => {
    clearInterval(sample);
    return (code as number | null) ?? (sig as string);
  });
  return { proc, stderr: () => err, exited, peakRssKb: () => peak };
}

/** Waits until `pred` holds (polling), or throws naming `what`. */
export async function waitFor(pred: () => boolean, what: string, ms = 20_000): Promise<void> {
  const end = performance.now() + ms;
  while (!pred()) {
    if (performance.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

/** Every entry of a journal (the reader tolerates a cut last line). */
export async function journalEntries(path: string): Promise<JournalEntry[]> {
  const out: JournalEntry[] = [];
  if (!existsSync(path)) return out;
  for await (const e of readJournalFile(path)) out.push(e);
  return out;
}

/** The data lines of a journal file as they are on disk right now (cheap, for polling). */
export function journalDataLines(path: string): string[] {
  if (!existsSync(path)) return [];
  const text = readFileSync(path, 'latin1');
  const lines = text.split('\n');
  lines.pop(); // an unterminated tail is not a line yet
  return lines.filter((l) => /^[0-9]/.test(l)).map((l) => l.slice(l.indexOf(' ') + 1));
}

export function journalText(path: string): string {
  return existsSync(path) ? readFileSync(path, 'latin1') : '';
}
