// `record` and `live` never write over an input or a journal (#14 "Output safety"): each refusal is one line,
// a non-zero exit before the port is opened, and every file byte-for-byte as it was.
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable, Writable } from 'node:stream';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-rec-out-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const RIG = `${JSON.stringify({ length_m: 0.9, length_u_m: 3e-4, flag_width_m: 0.02, flag_width_u_m: 1e-4 })}\n`;
const JOURNAL = '#halfswing-journal 1\n#start 2026-01-05T09:00:00.000Z\n#source recorded\n1000 H 0 halfswing proto=1 fw=1.0.0 mcu=atmega328p hz=16000000 ch=2 boot=1a2b *00\n';
writeFileSync(join(dir, 'rig.json'), RIG);
writeFileSync(join(dir, 'run.journal'), JOURNAL);
writeFileSync(join(dir, 'notes.txt'), 'bench log\n');
// A port that does not exist: a command that got as far as the port would fail there, after its checks.
const PORT = join(dir, 'ttyNONE');

async function cli(argv: string[]): Promise<{ code: number; err: string }> {
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, { stdout: sink(() => {}), stderr: sink((s) => (err += s)), stdin: Readable.from([]), env: {}, cwd: dir });
  return { code, err };
}

function unchanged(): void {
  expect(readFileSync(join(dir, 'rig.json'), 'utf8')).toBe(RIG);
  expect(readFileSync(join(dir, 'run.journal'), 'latin1')).toBe(JOURNAL);
  expect(readFileSync(join(dir, 'notes.txt'), 'utf8')).toBe('bench log\n');
  expect(readdirSync(dir).sort()).toEqual(['notes.txt', 'rig.json', 'run.journal']);
}

describe('record and live refuse outputs that would destroy a file', () => {
  it.each([
    ['record --status onto the rig', ['record', '--rig', 'rig.json', '--journal', 'new.journal', '--status', 'rig.json'], /--status .*rig\.json is the input .*rig\.json \(same file\); refusing to write over it/],
    ['record --status onto an existing journal', ['record', '--rig', 'rig.json', '--journal', 'new.journal', '--status', 'run.journal'], /--status .*run\.journal is an existing journal; refusing to write over it/],
    ['record --status onto its own --journal', ['record', '--rig', 'rig.json', '--journal', 'new.journal', '--status', './new.journal'], /--status and --journal name the same file/],
    ['record --journal onto the rig', ['record', '--rig', 'rig.json', '--journal', 'rig.json'], /rig\.json is not a halfswing journal .*refusing to write to it/],
    ['record --journal onto another text file', ['record', '--rig', 'rig.json', '--journal', 'notes.txt'], /notes\.txt is not a halfswing journal/],
    ['live --journal onto the rig', ['live', '--port', PORT, '--rig', 'rig.json', '--journal', 'rig.json'], /rig\.json is not a halfswing journal .*refusing to write to it/],
    ['live --journal onto another text file', ['live', '--port', PORT, '--rig', 'rig.json', '--journal', 'notes.txt'], /notes\.txt is not a halfswing journal/],
  ])('%s', async (_name, argv, why) => {
    const { code, err } = await cli([...argv, ...(argv[0] === 'record' ? ['--port', PORT] : [])]);
    expect(code).not.toBe(0);
    expect(err.trim().split('\n').filter((l) => !l.includes('note: '))).toEqual([expect.stringMatching(why)]);
    expect(err).not.toMatch(/\n\s+at /);
    unchanged();
  });

  it('an existing journal is appended to, never replaced: its bytes stay its first bytes', async () => {
    // The port does not exist, so nothing is appended either: the journal is opened, checked, and left alone.
    const { code } = await cli(['record', '--rig', 'rig.json', '--journal', 'run.journal', '--port', PORT]);
    expect(code).not.toBe(0);
    expect(readFileSync(join(dir, 'run.journal'), 'latin1').startsWith(JOURNAL)).toBe(true);
    expect(existsSync(join(dir, 'new.journal'))).toBe(false);
  });
});
