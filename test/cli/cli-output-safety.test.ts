// No command writes over one of its inputs or an existing journal, whatever the flags and however the file is
// named (symlink, hard link); other outputs are written whole or not at all; every refusal is one line.
import { afterAll, describe, expect, it } from 'vitest';
import { chmodSync, linkSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable, Writable } from 'node:stream';
import { runCli } from '../../host/cli/main.ts';
import { guardOutputs, writeWhole } from '../../host/files/safe-output.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-output-safety-'));
chmodSync(dir, 0o755);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const journalText = [...simulateJournal(loadScenario('demo-low-q'), { seed: 3, durationS: 120 }).lines].join('\n') + '\n';
/** A journal as a recorder writes it: its #source names a port, not the simulator. */
const recordedText = journalText.replace(/^#source .*$/m, '#source halfswing record, port /dev/ttyACM0');

function file(name: string, text: string): string {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

async function cli(argv: string[], stdin: Readable = Readable.from([])): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, { stdout: sink((s) => (out += s)), stderr: sink((s) => (err += s)), stdin, env: {}, cwd: dir });
  return { code, out, err };
}

/** One failure: a non-zero exit, exactly one line on stderr naming the file, nothing on stdout. */
function oneLineFailure(r: { code: number; out: string; err: string }, mentions: string): void {
  expect(r.code).not.toBe(0);
  expect(r.out).toBe('');
  expect(r.err.trimEnd().split('\n')).toHaveLength(1);
  expect(r.err).toContain(mentions);
  expect(r.err).not.toMatch(/\n\s+at /);
}

describe('analyze never writes over its input or a journal', () => {
  it.each([
    ['--csv', 'same name'],
    ['--report', 'same name'],
  ])('analyze J %s J (%s): refused, J unchanged', async (flag) => {
    const j = file(`self${flag}.journal`, journalText);
    const r = await cli(['analyze', j, flag, j]);
    oneLineFailure(r, 'refusing to write over it');
    expect(readFileSync(j, 'utf8')).toBe(journalText);
  });

  it('through a symlink and a hard link to the input (compared by device + inode)', async () => {
    const j = file('linked.journal', journalText);
    symlinkSync(j, join(dir, 'soft.csv'));
    linkSync(j, join(dir, 'hard.html'));
    oneLineFailure(await cli(['analyze', 'linked.journal', '--csv', 'soft.csv']), 'same file');
    oneLineFailure(await cli(['analyze', 'linked.journal', '--report', 'hard.html']), 'same file');
    expect(readFileSync(j, 'utf8')).toBe(journalText);
  });

  it('over another existing journal, recorded or simulated', async () => {
    const j = file('input.journal', journalText);
    const other = file('other.journal', recordedText);
    const sim = file('sim.journal', journalText);
    oneLineFailure(await cli(['analyze', j, '--csv', other]), 'is an existing journal');
    oneLineFailure(await cli(['analyze', j, '--report', sim]), 'is an existing journal');
    expect(readFileSync(other, 'utf8')).toBe(recordedText);
    expect(readFileSync(sim, 'utf8')).toBe(journalText);
  });

  it('over the rig file it reads, or twice into one file', async () => {
    const j = file('rigged.journal', journalText);
    const rig = file('rig.json', JSON.stringify({ length_m: 0.6, flag_width_m: 0.03 }));
    oneLineFailure(await cli(['analyze', j, '--rig', rig, '--csv', rig]), 'same file');
    oneLineFailure(await cli(['analyze', j, '--csv', 'both.out', '--report', 'both.out']), 'the same file');
  });

  it('over the file standard input was redirected from', async () => {
    const j = file('stdin.journal', journalText);
    const { openSync, createReadStream } = await import('node:fs');
    const fd = openSync(j, 'r');
    // The descriptor stands in for fd 0: guard it as `analyze -` does.
    await expect(guardOutputs([{ path: j, flag: '--csv' }], [{ fd, label: 'on standard input' }])).rejects.toThrow(/same file/);
    createReadStream('', { fd }).destroy();
    expect(readFileSync(j, 'utf8')).toBe(journalText);
  });

  it('writes an ordinary output whole, says so, and replaces an old CSV', async () => {
    const j = file('ok.journal', journalText);
    file('old.csv', 'stale\n');
    const r = await cli(['analyze', j, '--csv', 'old.csv', '--json']);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^halfswing analyze: wrote old\.csv \(\d+ rows\)\n$/);
    expect(readFileSync(join(dir, 'old.csv'), 'utf8')).toMatch(/^[a-z_]+,/);
    const s = await cli(['analyze', j, '--report', 'r.html']);
    expect(s.out).toMatch(/halfswing analyze: wrote r\.html\n$/);
  });
});

describe('writeWhole', () => {
  it('leaves the old file and no temporary file when the writing fails part-way', async () => {
    const sub = join(dir, 'whole');
    mkdirSync(sub);
    const target = join(sub, 'out.csv');
    writeFileSync(target, 'old contents\n');
    function* failing(): Generator<string> {
      yield 'a,b\n';
      throw new Error('generator broke');
    }
    await expect(writeWhole([{ path: target, chunks: failing() }])).rejects.toThrow(/cannot write/);
    expect(readFileSync(target, 'utf8')).toBe('old contents\n');
    expect(readdirSync(sub)).toEqual(['out.csv']);
  });
});

describe('sim --journal', () => {
  it('refuses an existing file unless --force, and never replaces a recorded journal', async () => {
    const notes = file('notes.txt', 'my notes\n');
    oneLineFailure(await cli(['sim', '--journal', notes, '--duration', '20s']), 'add --force');
    expect(readFileSync(notes, 'utf8')).toBe('my notes\n');
    const rec = file('recorded.journal', recordedText);
    oneLineFailure(await cli(['sim', '--journal', rec, '--duration', '20s', '--force']), 'is an existing journal');
    expect(readFileSync(rec, 'utf8')).toBe(recordedText);
    const simJ = file('again.journal', journalText);
    const r = await cli(['sim', '--journal', simJ, '--duration', '20s', '--force']);
    expect(r.code).toBe(0);
    expect(readFileSync(simJ, 'utf8')).not.toBe(journalText);
  });

  it('into a missing folder: one line, non-zero', async () => {
    oneLineFailure(await cli(['sim', '--journal', join(dir, 'no-such-folder', 'x.journal'), '--duration', '20s']), 'does not exist');
  });

  it('reports a short run in seconds, not hours', async () => {
    const r = await cli(['sim', '--journal', 'short.journal', '--duration', '30s']);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/30\.0 s of rig time/);
  });
});

describe('arguments that look like negative numbers', () => {
  it('--ppm -200 is a value, and --duration -5 a clear error', async () => {
    const ok = await cli(['sim', '--ppm', '-200', '--duration', '5s']);
    expect(ok.code).toBe(0);
    expect(ok.out).toMatch(/^#halfswing-journal 1\n/);
    const bad = await cli(['sim', '--duration', '-5']);
    expect(bad.code).toBe(2);
    expect(bad.err.trim()).toBe("halfswing: --duration must be a positive time like 90s, 20m, 2h or 7d, not '-5'");
  });
});

describe('analyze - reads standard input', () => {
  it('gives the same figures as the file', async () => {
    const j = file('piped.journal', journalText);
    const a = await cli(['analyze', j, '--json']);
    const b = await cli(['analyze', '-', '--json'], Readable.from([Buffer.from(journalText, 'latin1')]));
    expect(b.code).toBe(0);
    expect(JSON.parse(b.out)).toEqual(JSON.parse(a.out));
  });
});
