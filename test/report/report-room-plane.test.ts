// The report of a run with the room sensor and of a two-beam run (#16, #18): the reduced period beside the room
// against time, the plane's and the room's numbers in the further results, each equal to the JSON's, well-formed.
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { renderReport } from '../../host/report/index.ts';
import { analyzeJournalFile } from '../../host/pipeline/analyze-entries.ts';
import { loadScenario, parseScenario, simulateJournal, type Scenario } from '../../sim/index.ts';
import { expectReportMatchesJson, shownByKey } from './report-numbers.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-report-room-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function reportOf(sc: Scenario, name: string, durationS: number) {
  const journal = join(dir, `${name}.journal`);
  writeFileSync(journal, [...simulateJournal(sc, { seed: 2, durationS }).lines].join('\n') + '\n');
  const { pipeline, result } = await analyzeJournalFile(journal);
  const sha = createHash('sha256').update(readFileSync(journal)).digest('hex');
  const html = renderReport(result, { journalName: `${name}.journal`, journalSha256: sha, rig: pipeline.rig(), csvName: null });
  return { html, json: JSON.parse(JSON.stringify(result)) as Record<string, unknown> & { environment: Record<string, number> | null; plane: Record<string, number> | null } };
}

describe('report with the room and the plane', () => {
  it('a run with room readings: the period beside temperature, pressure and humidity, the room numbers equal to the JSON', async () => {
    const base = loadScenario('demo-low-q');
    const sc = parseScenario({ ...JSON.parse(JSON.stringify(base)), room: { temp_period_h: 0.25 } });
    const { html, json } = await reportOf(sc, 'room', 600);
    expect(XMLValidator.validate(html)).toBe(true);
    expect(json.environment).not.toBeNull();
    expect(html).toContain('id="fig-t0-time"');
    expect(html).toContain('Reduced period and the room against time');
    for (const axis of ['temperature (°C)', 'pressure (hPa)', 'humidity (%RH)', 'T0 − mean (ppm)']) expect(html).toContain(axis);
    const shown = shownByKey(html);
    for (const k of ['temperature_mean_C', 'temperature_min_C', 'temperature_max_C', 'air_density_kg_m3', 'reference_temperature_C', 'humidity_mean_pct']) expect(shown.has(`environment.${k}`), k).toBe(true);
    expect(shown.has('environment.pressure_mean_hPa')).toBe(true);
    expect(expectReportMatchesJson(html, json)).toBeGreaterThan(40);
  });

  it('a two-beam run: the plane figures and the precession beside Foucault, equal to the JSON; no room panels', async () => {
    const { html, json } = await reportOf(loadScenario('plane-foucault-50n'), 'plane', 900);
    expect(XMLValidator.validate(html)).toBe(true);
    expect(json.plane).not.toBeNull();
    expect(json.environment).toBeNull();
    for (const id of ['fig-t0-time', 'fig-plane', 'fig-plane-top']) expect(html).toContain(`id="${id}"`);
    expect(html).not.toContain('temperature (°C)');
    const shown = shownByKey(html);
    for (const k of ['azimuth_start_deg', 'azimuth_end_deg', 'precession_deg_per_h', 'precession_u_deg_per_h', 'foucault_deg_per_h', 'airy_deg_per_h', 'minor_axis_max_mm'])
      expect(shown.has(`plane.${k}`), k).toBe(true);
    expect([...shown.keys()].some((k) => k.startsWith('environment.'))).toBe(false);
    expectReportMatchesJson(html, json);
  });
});
