// The one rig loader: every command resolves a relative --rig against its working directory, not the process's.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable, Writable } from 'node:stream';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';
import { loadRigFile } from '../../host/cli/rig-file.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-rig-cwd-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
writeFileSync(join(dir, 'bench.json'), JSON.stringify({ length_m: 0.9, length_u_m: 3e-4, flag_width_m: 0.02, flag_width_u_m: 1e-4 }));
writeFileSync(join(dir, 'bare.json'), JSON.stringify({ length_m: 0.9, flag_width_m: 0.02 }));

async function cli(argv: string[]): Promise<{ code: number; err: string }> {
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, { stdout: sink(() => {}), stderr: sink((s) => (err += s)), stdin: Readable.from([]), env: {}, cwd: dir });
  return { code, err };
}

describe('rig files are found from the command’s working directory', () => {
  it('loadRigFile resolves a relative path against cwd and names a missing file as given', () => {
    expect(process.cwd()).not.toBe(dir);
    expect(loadRigFile('bench.json', dir, () => {})).toMatchObject({ length_m: 0.9 });
    expect(() => loadRigFile('nope.json', dir, () => {})).toThrow('no such rig file: nope.json');
  });

  it('an assumed uncertainty is told once through the note callback', () => {
    const notes: string[] = [];
    loadRigFile('bare.json', dir, (l) => notes.push(l));
    expect(notes).toEqual([expect.stringMatching(/^halfswing: note: the rig gives no length_u_m \(1 mm assumed\) and flag_width_u_m/)]);
  });

  // Each command gets past the rig (relative to cwd) and stops at the next thing it needs.
  it.each([
    ['record', ['record', '--rig', 'bench.json', '--journal', join('no-such-folder', 'j'), '--port', join(dir, 'ttyNONE')], /cannot write journal/],
    ['probe', ['probe', '--rig', 'bench.json', '--port', join(dir, 'ttyNONE'), '--hello-timeout', '0.2'], /ttyNONE/],
    ['analyze', ['analyze', 'missing.journal', '--rig', 'bench.json'], /missing\.journal/],
  ])('%s', async (_name, argv, next) => {
    const r = await cli(argv);
    expect(r.code).not.toBe(0);
    expect(r.err).not.toMatch(/rig file/);
    expect(r.err).toMatch(next);
  });
});
