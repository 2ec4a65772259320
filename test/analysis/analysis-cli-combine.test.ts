// `halfswing combine` end to end on `sim --session` journals: the JSON contract of issue #17, the Done-when figures
// against the session's truth, the text summary, the report, and one-line refusals that leave every file as it was.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { cliIn } from './cli-in-dir.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-combine-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const cli = (argv: string[]) => cliIn(dir, argv);

type Json = Record<string, unknown> & { g_m_s2: number; g_u_m_s2: number; journals: Record<string, unknown>[] };
const journals = (session: string): string[] =>
  readdirSync(join(dir, session))
    .filter((f) => f.endsWith('.journal'))
    .sort()
    .map((f) => `${session}/${f}`);
const truth = (session: string): Record<string, number> => JSON.parse(readFileSync(join(dir, session, `${session}.session-truth.json`), 'utf8')) as Record<string, number>;

beforeAll(async () => {
  for (const s of ['two-length-carbide', 'reversible-bar', 'tuning-bar']) {
    mkdirSync(join(dir, s));
    const r = await cli(['sim', '--session', s, '--out', s, '--seed', '1']);
    expect(r.code, r.err).toBe(0);
  }
  mkdirSync(join(dir, 'short'));
  expect((await cli(['sim', '--session', 'two-length-carbide', '--out', 'short', '--duration', '3s'])).code).toBe(0);
}, 120_000);

describe('halfswing combine', () => {
  it('two lengths (1.20 m and 0.60 m readings, 6 mm offset, differences to 20 µm): g and the offset within their u, u(g)/g ≤ 4e-5 (issue #17 Done when)', async () => {
    const r = await cli(['combine', ...journals('two-length-carbide'), '--json']);
    expect(r.code, r.err).toBe(0);
    const o = JSON.parse(r.out) as Json;
    expect(Object.keys(o).slice(0, 6)).toEqual(['method', 'g_m_s2', 'g_u_m_s2', 'length_offset_m', 'length_offset_u_m', 'journals']);
    expect(o.method).toBe('two-length');
    const t = truth('two-length-carbide');
    // The simulator's true g and offset (its session truth file) are the independent truth here.
    expect(Math.abs(o.g_m_s2 - t.g_m_s2!)).toBeLessThan(o.g_u_m_s2);
    expect(o.g_u_m_s2 / o.g_m_s2).toBeLessThanOrEqual(4e-5);
    expect(Math.abs((o.length_offset_m as number) - t.length_offset_m!)).toBeLessThan(o.length_offset_u_m as number);
    expect(o.journals.map((j) => Object.keys(j))).toEqual([
      ['file', 'T0_s', 'T0_u_s', 'length_m'],
      ['file', 'T0_s', 'T0_u_s', 'length_m'],
    ]);
    expect(o.journals.map((j) => j.length_m)).toEqual([1.2, 0.6]);
    // Not on --json's stdout: the status line of the reductions, on stderr.
    expect(r.err).toContain('reducing 2/2');
    expect(r.err).toContain('again at');
  });

  it('reversible bar (l to 20 µm, h to 1 mm, T1 − T2 ≈ 0.5 ms): g within its u, u(g)/g ≤ 2.5e-5; T0 exactly as analyze gives it', async () => {
    const files = journals('reversible-bar');
    const r = await cli(['combine', ...files, '--json']);
    expect(r.code, r.err).toBe(0);
    const o = JSON.parse(r.out) as Json;
    expect(Object.keys(o).slice(0, 4)).toEqual(['method', 'g_m_s2', 'g_u_m_s2', 'journals']);
    expect(o.method).toBe('reversible');
    expect(o).not.toHaveProperty('crossing_position_m');
    expect(Math.abs(o.g_m_s2 - truth('reversible-bar').g_m_s2!)).toBeLessThan(o.g_u_m_s2);
    expect(o.g_u_m_s2 / o.g_m_s2).toBeLessThanOrEqual(2.5e-5);
    expect(o.journals.map((j) => j.pivot)).toEqual([1, 2]);
    // The same reduction as analyze: its JSON for the same journal has the same T0 to the last bit, and g null.
    const a = JSON.parse((await cli(['analyze', files[1]!, '--json'])).out) as Record<string, unknown>;
    expect(a.T0_s).toBe(o.journals[1]!.T0_s);
    expect(a.T0_u_s).toBe(o.journals[1]!.T0_u_s);
    expect(a.g_m_s2).toBeNull();
    const other = (a.warnings as { kind: string; text: string }[]).find((w) => w.kind === 'reversible-other-pivot');
    expect(other?.text).toContain('g needs the other pivot');
    // The budget shows each term of Bessel's formula.
    const ids = (o.budget as { id: string }[]).map((b) => b.id);
    for (const id of ['knife-edge-distance', 'centre-of-mass-distances', 'pivot-1-statistics', 'pivot-2-statistics', 'amplitude-reduction', 'clock']) expect(ids).toContain(id);
    expect(ids).not.toContain('air');
  });

  it('a tuning series: the crossing within its uncertainty, g there within its u, and the next move toward the crossing', async () => {
    const r = await cli(['combine', ...journals('tuning-bar'), '--json']);
    expect(r.code, r.err).toBe(0);
    const o = JSON.parse(r.out) as Json;
    const t = truth('tuning-bar');
    // k = 2 on one seed: a k = 1 check fails one seed in three by design (1.24 u after the model's S line per
    // boot shifted the link's random draws); coverage over seeds is the combine coverage test's job.
    expect(Math.abs((o.crossing_position_m as number) - t.crossing_position_m!)).toBeLessThan(2 * (o.crossing_position_u_m as number));
    expect(Math.abs(o.g_m_s2 - t.g_m_s2!)).toBeLessThan(o.g_u_m_s2);
    expect(o.journals).toHaveLength(8);
    expect(o.journals.every((j) => typeof j.mass_position_m === 'number')).toBe(true);
    // The last journal had the mass at 50 mm; the crossing is near 35 mm.
    expect(o.next_move_m as number).toBeCloseTo(t.crossing_position_m! - 0.05, 5);
  });

  it('the text summary: value ± u with k = 1, the k = 2 figure labelled, every budget term, and which way to move the mass', async () => {
    const two = await cli(['combine', ...journals('two-length-carbide')]);
    expect(two.code).toBe(0);
    // The expanded figure by the same rounding as u (host/output/value-u.ts): U to two digits, g at U's place.
    expect(two.out).toMatch(/g {16}9\.812\d+ ± 0\.000\d\d m\/s² \(k = 1\); expanded 9\.81\d+ ± 0\.00\d+ m\/s² \(k = 2\)/);
    for (const term of ['length differences', 'T0 at reading 1.2 m', 'T0 at reading 0.6 m', 'corrections per length', 'air buoyancy', 'device clock']) expect(two.out).toContain(term);
    const tune = await cli(['combine', ...journals('tuning-bar')]);
    expect(tune.out).toMatch(/next {13}move the mass 1\d\.\d\d mm towards smaller mass_position_m/);
  });

  it('--report: one XHTML-valid page with T0 per journal, T0² against length with the fit; T1, T2 and their crossing', async () => {
    expect((await cli(['combine', ...journals('two-length-carbide'), '--report', 'two.html'])).code).toBe(0);
    const two = readFileSync(join(dir, 'two.html'), 'utf8');
    expect(XMLValidator.validate(two)).toBe(true);
    for (const id of ['result', 'journals', 'fig-length', 'budget']) expect(two).toContain(`id="${id}"`);
    expect(two.match(/data-key="T0_s"/g)).toHaveLength(2);
    const r = await cli(['combine', ...journals('tuning-bar'), '--report', 'tune.html', '--json']);
    expect(r.err).toContain('wrote tune.html');
    const tune = readFileSync(join(dir, 'tune.html'), 'utf8');
    expect(XMLValidator.validate(tune)).toBe(true);
    expect(tune).toContain('id="fig-series"');
    expect(tune).toContain('crossing');
  });

  it('refuses bad input in one line with a non-zero exit, writing nothing and changing no input', async () => {
    const tl = journals('two-length-carbide');
    const rev = journals('reversible-bar');
    const before = readFileSync(join(dir, tl[0]!), 'utf8');
    writeFileSync(join(dir, 'notes.txt'), 'pendulum notes\n');
    writeFileSync(join(dir, 'brass.journal'), [...simulateJournal(loadScenario('brass-1m-two-hours'), { seed: 2, durationS: 60 }).lines].join('\n') + '\n');
    const cases: [string[], RegExp][] = [
      [[tl[0]!], /needs two or more journals/],
      [[tl[0]!, 'nowhere.journal'], /no such journal: .*nowhere\.journal/],
      [[tl[0]!, rev[0]!], /is an ordinary pendulum and .* a reversible one/],
      [[tl[0]!, 'brass.journal'], /different bobs/],
      [[rev[1]!, journals('tuning-bar')[0]!], /gives no mass_position_m/],
      [[rev[0]!, rev[0]!], /every journal swings about pivot 1: time the bar about pivot 2 too/],
      [journals('short'), /too few passes/],
      [[tl[0]!, tl[1]!, '--report', tl[0]!], /--report/],
      [['notes.txt', tl[0]!], /not a halfswing journal/],
    ];
    for (const [args, msg] of cases) {
      const r = await cli(['combine', ...args]);
      expect(r.code, args.join(' ')).not.toBe(0);
      expect(r.out).toBe('');
      const lines = r.err.split('\n').filter((l) => l !== '' && !l.startsWith('halfswing combine: reducing'));
      expect(lines, args.join(' ')).toHaveLength(1);
      expect(lines[0]).toMatch(msg);
      expect(lines[0]).not.toMatch(/\bat .*\.ts:\d+/);
    }
    expect(readFileSync(join(dir, tl[0]!), 'utf8')).toBe(before);
    expect(readdirSync(dir).filter((f) => f.includes('.tmp-'))).toEqual([]);
  });

  it('--help names the method and the options', async () => {
    const r = await cli(['combine', '--help']);
    expect(r.code).toBe(0);
    expect(r.out).toContain('Usage: halfswing combine JOURNAL JOURNAL...');
    expect(r.out).toContain('--report');
    expect(r.out).toContain("Bessel's formula");
  });
});
