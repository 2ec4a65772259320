// Golden `analyze --json` outputs of every bundled scenario (sim/scenarios, seed 1, full duration): a refactor of
// the pipeline or the analysis must reproduce every figure of them.
//
// Regenerate (only when a change moves figures on purpose, and say which and why in the commit):
//   UPDATE_GOLDEN=1 npx vitest run test/golden
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { Readable, Writable } from 'node:stream';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';
import { listScenarios, loadScenario, simulateJournal } from '../../sim/index.ts';
import { goldenDifferences, goldenText } from './golden-compare.ts';

const GOLDEN_DIR = join(dirname(fileURLToPath(import.meta.url)), 'analyze');
const SEED = 1;
const update = process.env.UPDATE_GOLDEN === '1';
const dir = mkdtempSync(join(tmpdir(), 'halfswing-golden-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** `halfswing analyze JOURNAL --json` in-process, on the journal the simulator writes for the scenario. */
async function analyzeJson(name: string): Promise<unknown> {
  const journal = join(dir, `${name}.journal`);
  writeFileSync(journal, `${[...simulateJournal(loadScenario(name), { seed: SEED }).lines].join('\n')}\n`);
  let out = '';
  let err = '';
  const sink = (f: (s: string) => void): Writable => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(['analyze', journal, '--json'], { stdout: sink((s) => (out += s)), stderr: sink((s) => (err += s)), stdin: Readable.from([]), env: {}, cwd: dir });
  expect(err).toBe('');
  expect(code).toBe(0);
  return JSON.parse(out) as unknown;
}

describe('golden analyze --json of the bundled scenarios', () => {
  it('covers every bundled scenario', () => {
    expect(listScenarios().length).toBeGreaterThanOrEqual(5);
  });

  it('the comparison tolerates last-bit reordering but not a moved figure, a changed word or a lost key', () => {
    const g = { g: 9.81234567, w: ['a'], s: { n: 3 }, p: Array.from({ length: 450 }, (_, i) => i / 7) };
    const stored = JSON.parse(goldenText(g)) as unknown;
    expect(goldenDifferences({ ...g, g: 9.81234567 * (1 + 4e-16), extra: 1 }, stored)).toEqual([]);
    expect(goldenDifferences({ ...g, g: 9.81234567 * (1 + 1e-9) }, stored)).toHaveLength(1);
    expect(goldenDifferences({ ...g, w: ['b'] }, stored)).toHaveLength(1);
    expect(goldenDifferences({ ...g, s: {} }, stored)).toEqual(['$.s.n: missing']);
    expect(goldenDifferences({ ...g, p: g.p.map((v, i) => (i === 9 ? v + 1e-6 : v)) }, stored)).toHaveLength(1);
    expect(goldenDifferences({ ...g, p: g.p.slice(1) }, stored)).toHaveLength(1);
  });

  for (const name of listScenarios()) {
    it(`${name} (seed ${SEED}) reproduces its golden output`, async () => {
      const file = join(GOLDEN_DIR, `${name}.seed${SEED}.json`);
      const actual = await analyzeJson(name);
      if (update || !existsSync(file)) {
        if (!update) throw new Error(`no golden file for ${name}: run UPDATE_GOLDEN=1 npx vitest run test/golden`);
        writeFileSync(file, goldenText(actual));
        return;
      }
      const golden = JSON.parse(readFileSync(file, 'utf8')) as unknown;
      expect(goldenDifferences(actual, golden).slice(0, 20)).toEqual([]);
    });
  }
});
