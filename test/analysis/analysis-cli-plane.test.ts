// `halfswing analyze` on a two-beam run: the `plane` object's contract keys, the CSV's two columns, null/empty for one beam.
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cliIn } from './cli-in-dir.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-analyze-plane-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function journal(name: string, scenario: string, durationS: number): string {
  const { lines } = simulateJournal(loadScenario(scenario), { seed: 2, durationS });
  writeFileSync(join(dir, name), [...lines].join('\n') + '\n');
  return name;
}

const cli = (argv: string[]) => cliIn(dir, argv);

/** Issue #16's contract: exactly these keys. */
const PLANE_KEYS = ['airy_deg_per_h', 'azimuth_end_deg', 'azimuth_start_deg', 'foucault_deg_per_h', 'minor_axis_max_m', 'precession_deg_per_h', 'precession_u_deg_per_h'];

describe('analyze on two beams', () => {
  it('--json gives plane with exactly the contract keys, and the Foucault rate at the rig latitude', async () => {
    const j = journal('two.journal', 'plane-foucault-50n', 600);
    const r = await cli(['analyze', j, '--json']);
    expect(r.code).toBe(0);
    const plane = (JSON.parse(r.out) as { plane: Record<string, number | null> }).plane;
    expect(Object.keys(plane).sort()).toEqual(PLANE_KEYS);
    // −15.041 °/h·sin 50° (docs/references.md#ref-swing-plane)
    expect(plane.foucault_deg_per_h).toBeCloseTo(-11.522, 3);
    expect(Math.abs(plane.precession_deg_per_h! - plane.foucault_deg_per_h!)).toBeLessThan(0.1);
  });

  it('--csv fills azimuth_deg and minor_axis_m on a two-beam run and leaves them empty on one beam', async () => {
    const two = journal('two-csv.journal', 'plane-anisotropic-push', 120);
    expect((await cli(['analyze', two, '--csv', 'two.csv'])).code).toBe(0);
    const rows = readFileSync(join(dir, 'two.csv'), 'utf8').trim().split('\n');
    const head = rows[0]!.split(',');
    const ia = head.indexOf('azimuth_deg');
    const ib = head.indexOf('minor_axis_m');
    expect(ia).toBeGreaterThan(0);
    expect(ib).toBeGreaterThan(0);
    const cells = rows.slice(1).map((l) => l.split(','));
    const filled = cells.filter((c) => c[ia] !== '' && c[ib] !== '');
    expect(filled.length).toBeGreaterThan(0.9 * cells.length);
    // Released 12° off the reference direction with a push: the axis starts near 12°, the ellipse is open.
    expect(Number(filled[1]![ia])).toBeCloseTo(12, 0);
    expect(Math.abs(Number(filled[1]![ib]))).toBeGreaterThan(1e-4);

    const one = journal('one.journal', 'demo-low-q', 60);
    const r = await cli(['analyze', one, '--csv', 'one.csv', '--json']);
    expect((JSON.parse(r.out) as { plane: unknown }).plane).toBeNull();
    const oneRows = readFileSync(join(dir, 'one.csv'), 'utf8').trim().split('\n').slice(1);
    for (const l of oneRows) expect(l.endsWith(',,')).toBe(true);
  });
});

describe('report on two beams', () => {
  it('adds the swing-plane figure and the top view with one ellipse per chosen pass; a one-beam report has neither', async () => {
    const two = journal('two-report.journal', 'plane-turns-40deg', 300);
    expect((await cli(['analyze', two, '--report', 'two.html'])).code).toBe(0);
    const html = readFileSync(join(dir, 'two.html'), 'utf8');
    expect(html).toContain('id="fig-plane"');
    expect(html).toContain('id="fig-plane-top"');
    expect(html.match(/t = [\d.]+ (s|min|h)/g)!.length).toBeGreaterThanOrEqual(5);
    const one = journal('one-report.journal', 'demo-low-q', 60);
    expect((await cli(['analyze', one, '--report', 'one.html'])).code).toBe(0);
    expect(readFileSync(join(dir, 'one.html'), 'utf8')).not.toContain('fig-plane');
  });
});
