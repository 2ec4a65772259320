// The bundle built at install (bin/build.js → dist/) behaves exactly like the sources run through tsx.
// Every other test runs the sources (vitest.config.ts sets HALFSWING_DEV=1); this one builds a fresh bundle
// into a scratch folder, so it never judges a stale dist/.
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
const BIN = join(ROOT, 'bin', 'halfswing.js');
// Inside the repository, so that the bundle's package imports resolve to its node_modules.
mkdirSync(join(ROOT, '.tmp'), { recursive: true });
const work = mkdtempSync(join(ROOT, '.tmp', 'bundle-test-'));
const out = join(work, 'dist');
const journal = join(work, 'club.journal');

interface Run {
  readonly code: number | null;
  readonly stdout: string;
  readonly stderr: string;
}

function run(script: string, args: readonly string[], dev: boolean): Run {
  const env: NodeJS.ProcessEnv = { ...process.env, CI: 'true' };
  delete env.HALFSWING_DEV;
  if (dev) env.HALFSWING_DEV = '1';
  const r = spawnSync(process.execPath, [script, ...args], { cwd: work, encoding: 'utf8', env });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
const fromBundle = (args: readonly string[]): Run => run(join(out, 'halfswing.js'), args, false);
const fromSource = (args: readonly string[]): Run => run(BIN, args, true);

beforeAll(() => {
  execFileSync(process.execPath, [join(ROOT, 'bin', 'build.js'), out], { stdio: 'pipe' });
  // 15 minutes of the club rig: a short run with a full result (g, Q) to compare.
  writeFileSync(journal, `${[...simulateJournal(loadScenario('club-resonator'), { seed: 5, durationS: 900 }).lines].join('\n')}\n`);
});

afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('the bundle gives the same output as the sources', () => {
  it.each([[['--help']], [['analyze', '--help']], [['analyze', 'club.journal', '--json']], [['sim', '--list']]])('halfswing %j', (args) => {
    const b = fromBundle(args);
    const s = fromSource(args);
    expect(b.stderr).toBe(s.stderr);
    expect(b.code).toBe(s.code);
    expect(b.code).toBe(0);
    expect(b.stdout).toBe(s.stdout);
    expect(b.stdout.length).toBeGreaterThan(100);
  });

  it('watch replays through the bundled result worker, not the main-thread fallback', () => {
    const args = ['watch', 'club.journal', '--speed', '1000000'];
    const b = fromBundle(args);
    expect(b.stderr).not.toContain('main thread');
    expect(b.code).toBe(0);
    expect(b.stdout.trim().split('\n').at(-1)).toMatch(/g=9\.\d+±/);
    expect(b.stdout).toBe(fromSource(args).stdout);
  });

  it('a user error is the same one line with the same exit code', () => {
    const b = fromBundle(['analyze', 'missing.journal']);
    expect(b.code).not.toBe(0);
    expect(b.stderr.trim().split('\n')).toHaveLength(1);
    expect(fromSource(['analyze', 'missing.journal'])).toEqual(b);
  });
});
