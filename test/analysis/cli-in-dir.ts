// Runs the halfswing CLI in-process in a folder, collecting its output.
import { Readable, Writable } from 'node:stream';
import { runCli } from '../../host/cli/main.ts';

export async function cliIn(cwd: string, argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, { stdout: sink((s) => (out += s)), stderr: sink((s) => (err += s)), stdin: Readable.from([]), env: {}, cwd });
  return { code, out, err };
}
