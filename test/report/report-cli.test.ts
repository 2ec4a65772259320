// `halfswing analyze JOURNAL --json --report FILE.html`: the page shows exactly the numbers `--json` prints.
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Writable, Readable } from 'node:stream';
import { XMLValidator } from 'fast-xml-parser';
import { runCli } from '../../host/cli/main.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { expectReportMatchesJson } from './report-numbers.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-report-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function journal(name: string, seed: number, durationS: number): string {
  const path = join(dir, `${name}.journal`);
  writeFileSync(path, [...simulateJournal(loadScenario('demo-low-q'), { seed, durationS }).lines].join('\n') + '\n');
  return path;
}

async function cli(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, {
    stdout: sink((s) => (out += s)),
    stderr: sink((s) => (err += s)),
    stdin: Readable.from([]),
    env: {},
    cwd: dir,
  });
  return { code, out, err };
}

describe('analyze --report', () => {
  it('writes a report whose every number equals the --json output of the same command', async () => {
    const j = journal('run-a', 21, 900);
    const r = await cli(['analyze', j, '--json', '--report', 'run-a.html', '--csv', 'run-a.csv']);
    // With --json on stdout, the "wrote" lines go to stderr.
    expect(r.err).toMatch(/^halfswing analyze: wrote run-a\.csv \(\d+ rows\)\nhalfswing analyze: wrote run-a\.html\n$/);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.out) as Record<string, unknown>;
    const html = readFileSync(join(dir, 'run-a.html'), 'utf8');
    expect(XMLValidator.validate(html)).toBe(true);
    expect(expectReportMatchesJson(html, json)).toBeGreaterThan(35);
    expect(html).toContain('<a href="./run-a.csv"');
    expect(existsSync(join(dir, 'run-a.csv'))).toBe(true);
    expect(html).toContain('<code data-key="journal">run-a.journal</code>');
  });

  it('links the CSV by its path from the report\'s folder when the two are written to different folders', async () => {
    const j = journal('run-b', 22, 120);
    mkdirSync(join(dir, 'pages'));
    mkdirSync(join(dir, 'tables'));
    const r = await cli(['analyze', j, '--report', 'pages/run-b.html', '--csv', 'tables/run b.csv']);
    expect(r.code).toBe(0);
    const html = readFileSync(join(dir, 'pages', 'run-b.html'), 'utf8');
    const href = /<a href="([^"]+)" data-key="csv"/.exec(html)?.[1];
    expect(href).toBe('./../tables/run%20b.csv');
    expect(existsSync(join(dir, 'pages', decodeURIComponent(href!)))).toBe(true);
  });

  it('a journal too short for the fits still gets a report, which names what is missing', async () => {
    const j = journal('short', 4, 3);
    const r = await cli(['analyze', j, '--json', '--report', 'short.html']);
    expect(r.code).toBe(0);
    const json = JSON.parse(r.out) as Record<string, unknown>;
    expect(json.B).toBeNull();
    const html = readFileSync(join(dir, 'short.html'), 'utf8');
    expect(XMLValidator.validate(html)).toBe(true);
    expect(html).toContain('id="missing"');
    expect(html).toContain('B and C:');
    expectReportMatchesJson(html, json);
    expect(readdirSync(dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
  });
});
