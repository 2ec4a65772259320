// A newcomer follows the README with the simulator in place of a board, as real processes, and makes the mistakes
// of issue #14. Each mistake must give one clear line, a non-zero exit, and leave every input byte for byte.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const bin = fileURLToPath(new URL('../../bin/halfswing.js', import.meta.url));
const dir = mkdtempSync(join(tmpdir(), 'halfswing-newcomer-'));
chmodSync(dir, 0o755);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Runs a shell line in the folder (so pipes are real); `asUser` drops root, where file modes would not bind. */
function sh(line: string, opts: { asUser?: boolean } = {}): { code: number; out: string; err: string } {
  const cmd = line.replaceAll('halfswing', `node ${bin}`);
  const dropRoot = opts.asUser && process.getuid?.() === 0;
  const argv = dropRoot ? ['setpriv', '--reuid=65534', '--regid=65534', '--clear-groups', 'bash', '-c', cmd] : ['bash', '-c', cmd];
  const r = spawnSync(argv[0]!, argv.slice(1), { cwd: dir, encoding: 'utf8', env: { ...process.env, NO_COLOR: '1', HOME: dir } });
  return { code: r.status ?? -1, out: r.stdout, err: r.stderr };
}

/** One failure: a non-zero exit, exactly one line on stderr, no stack trace. */
function oneLine(r: { code: number; err: string }, says: RegExp): void {
  expect(r.code).not.toBe(0);
  expect(r.err.trimEnd().split('\n')).toHaveLength(1);
  expect(r.err).toMatch(says);
  expect(r.err).not.toMatch(/\n\s+at |Error:|node:internal/);
}

let journal = '';
beforeAll(() => {
  // README, "the numbers": simulate a run, then analyse it.
  const r = sh('halfswing sim --scenario brass-1m-two-hours --duration 5m --no-faults --journal brass.journal');
  expect(r.code).toBe(0);
  expect(r.err).toMatch(/wrote brass\.journal .*5 min 00 s of rig time/);
  journal = readFileSync(join(dir, 'brass.journal'), 'latin1');
});

describe('the README steps work', () => {
  it('analyze prints a summary', () => {
    const r = sh('halfswing analyze brass.journal');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/g +9\.8\d* ± /);
    expect(r.out).not.toMatch(/0\.0\d h/);
  });

  it('the documented pipe: sim --duration 10m | analyze -', () => {
    const r = sh('halfswing sim --duration 10m | halfswing analyze -');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/halfswing analysis of standard input/);
  });

  it('analyze --json | head -c 50 exits quietly when the reader goes away', () => {
    const r = sh('halfswing analyze brass.journal --json | head -c 50; exit ${PIPESTATUS[0]}');
    expect(r.code).toBe(0);
    expect(r.out).toHaveLength(50);
    expect(r.err).toBe('');
  });
});

describe('the mistakes of issue #14: one line, non-zero exit, inputs unchanged', () => {
  const unchanged = (): void => expect(readFileSync(join(dir, 'brass.journal'), 'latin1')).toBe(journal);

  it.each([
    ['analyze J --csv J', 'halfswing analyze brass.journal --csv brass.journal', /refusing to write over it/],
    ['analyze J --report J', 'halfswing analyze brass.journal --report brass.journal', /refusing to write over it/],
    ['a CSV through a symlink to J', 'ln -sf brass.journal link.csv && halfswing analyze brass.journal --csv link.csv', /same file/],
    ['analyze - < J --csv J', 'halfswing analyze - --csv brass.journal < brass.journal', /refusing to write over it/],
    ['sim --journal over J', 'halfswing sim --duration 1m --journal brass.journal', /already exists.*--force/],
    ['sim --journal into a missing folder', 'halfswing sim --duration 1m --journal no/such/x.journal', /no\/such does not exist/],
    ['--duration -5', 'halfswing sim --duration -5', /--duration must be a positive time/],
    ['a typo in the file name', 'halfswing analyze brass.jornal', /no such journal/],
  ])('%s', (_what, line, says) => {
    oneLine(sh(line), says);
    unchanged();
  });

  it('sim --journal into a folder it may not write', () => {
    mkdirSync(join(dir, 'locked'), { mode: 0o555 });
    chmodSync(join(dir, 'locked'), 0o555);
    oneLine(sh('halfswing sim --duration 1m --journal locked/x.journal', { asUser: true }), /no permission to write in folder|permission denied/);
  });

  it('analyze of a journal it may not read', () => {
    writeFileSync(join(dir, 'secret.journal'), journal, { mode: 0o600 });
    chmodSync(join(dir, 'secret.journal'), 0o600);
    oneLine(sh('halfswing analyze secret.journal', { asUser: true }), /cannot read journal .*secret\.journal: permission denied/);
    expect(readFileSync(join(dir, 'secret.journal'), 'latin1')).toBe(journal);
  });

  it('a hard link is the same file too', () => {
    rmSync(join(dir, 'hard.html'), { force: true });
    symlinkSync(join(dir, 'brass.journal'), join(dir, 'sym.html'));
    oneLine(sh('ln brass.journal hard.html && halfswing analyze brass.journal --report hard.html'), /same file/);
    oneLine(sh('halfswing analyze brass.journal --report sym.html'), /same file/);
    unchanged();
  });
});
