// `halfswing analyze`: the JSON contract of the issue, the CSV, and one-line errors that leave nothing behind.
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cliIn } from './cli-in-dir.ts';
import { SWINGS_CSV_HEADER } from '../../host/output/swings-csv.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-analyze-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function journal(name: string, lines: Iterable<string>): string {
  const path = join(dir, name);
  writeFileSync(path, [...lines].join('\n') + '\n');
  return path;
}
const sim = (seed: number, durationS: number): Iterable<string> => simulateJournal(loadScenario('brass-1m-two-hours'), { seed, durationS }).lines;

const cli = (argv: string[]) => cliIn(dir, argv);

const KEYS = ['T0_s', 'T0_u_s', 'g_m_s2', 'g_u_m_s2', 'clock_ppm', 'clock_u_ppm', 'gate_offset_m', 'B', 'B_u', 'C', 'amplitude_start_deg', 'amplitude_end_deg', 'Q', 'damping_model', 'passes', 'periods', 'counts', 'budget', 'expected_g_m_s2', 'warnings'];
const COUNT_KEYS = ['crc_errors', 'lines_lost', 'device_lost', 'rejected_passes', 'bridged_gaps', 'reboots', 'disconnects'];

describe('halfswing analyze', () => {
  const j = journal('run.journal', sim(1, 900));

  it('--json prints exactly one JSON object with the issue’s keys, SI units and standard uncertainties', async () => {
    const r = await cli(['analyze', 'run.journal', '--json']);
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    expect(r.out.trim().split('\n')).toHaveLength(1);
    const o = JSON.parse(r.out) as Record<string, unknown>;
    for (const k of KEYS) expect(o).toHaveProperty(k);
    for (const k of COUNT_KEYS) expect(typeof (o.counts as Record<string, unknown>)[k]).toBe('number');
    expect(o.g_m_s2 as number).toBeGreaterThan(9.7);
    expect(o.g_m_s2 as number).toBeLessThan(9.9);
    expect(o.expected_g_m_s2 as number).toBeCloseTo(9.812350678, 6);
    for (const b of o.budget as { name: string; u_rel_g: number }[]) expect(typeof b.u_rel_g).toBe('number');
    expect(o).not.toHaveProperty('swings');
  });

  it('prints a human summary by default and writes the per-swing CSV', async () => {
    const r = await cli(['analyze', j, '--csv', 'swings.csv']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/g +9\.8\d+ ± 0\.00\d+ m\/s²/);
    const csv = readFileSync(join(dir, 'swings.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe(SWINGS_CSV_HEADER);
    expect(csv.length).toBeGreaterThan(700);
    const row = csv[10]!.split(',');
    expect(Number(row[4])).toBeGreaterThan(2);
    expect(Number(row[5])).toBeGreaterThan(1);
  });

  it('--clock takes host, pps, nominal or a ppm value, and refuses anything else', async () => {
    const given = JSON.parse((await cli(['analyze', j, '--json', '--clock', '42'])).out) as Record<string, unknown>;
    expect(given.clock_ppm).toBe(42);
    const nominal = JSON.parse((await cli(['analyze', j, '--json', '--clock', 'nominal'])).out) as Record<string, unknown>;
    expect(nominal.clock_ppm).toBe(0);
    // Warnings in JSON: the kind and its numbers, with the words beside them.
    expect((nominal.warnings as { kind: string; text: string }[]).some((w) => w.kind === 'clock-nominal' && /nominal device clock/.test(w.text))).toBe(true);
    const bad = await cli(['analyze', j, '--clock', 'fast']);
    expect(bad.code).toBe(2);
    expect(bad.err.trim().split('\n')).toHaveLength(1);
  });

  it('an output that cannot be written fails in one line and leaves neither output nor temporary files', async () => {
    const before = readdirSync(dir).sort();
    const r = await cli(['analyze', 'run.journal', '--csv', 'good.csv', '--report', 'no-such-dir/x.html']);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/cannot write/);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(readdirSync(dir).sort()).toEqual(before);
  });

  it.each([
    ['a missing file', ['analyze', 'nope.journal'], /no such journal/],
    ['a file of another format', ['analyze', 'other.txt'], /not a halfswing journal/],
    ['a rig file with a typo', ['analyze', 'run.journal', '--rig', 'typo.json'], /unknown rig key "lenght_m"/],
    ['a journal with no passes', ['analyze', 'still.journal', '--csv', 'x.csv', '--report', 'x.html'], /no passes/],
  ])('%s: one line, non-zero exit, nothing written', async (_what, argv, msg) => {
    writeFileSync(join(dir, 'other.txt'), 'hello\nworld\n');
    writeFileSync(join(dir, 'typo.json'), '{"lenght_m": 1, "flag_width_m": 0.02}');
    journal('still.journal', ['#halfswing-journal 1', '#start 2026-01-01T00:00:00.000Z', '1000 H 0 halfswing proto=1 fw=1.0.0 mcu=x hz=16000000 ch=2 boot=00ab *00']);
    const before = readdirSync(dir).sort();
    const r = await cli(argv);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(msg);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).not.toMatch(/at .*\.ts:\d+/);
    expect(r.out).toBe('');
    expect(readdirSync(dir).sort()).toEqual(before);
  });
});
