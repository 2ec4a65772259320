// The report of simulated runs: every section, the same numbers as the JSON, well-formed, and honest when short.
import { warningText } from '../../host/output/warning-words.ts';
import { afterAll, describe, expect, it } from 'vitest';
import { rmSync } from 'node:fs';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { renderReport } from '../../host/report/index.ts';
import { expectReportMatchesJson } from './report-numbers.ts';
import { simulatedRun, type SimRun } from './sim-run.ts';

const SECTIONS = ['run', 'rig', 'result', 'details', 'plots', 'fig-period', 'fig-amplitude', 'fig-q', 'fig-alternation', 'fig-clock', 'fig-g', 'budget', 'corrections', 'counts', 'warnings', 'footer'];
const runs: SimRun[] = [];
const text = (html: string): string => JSON.stringify(new XMLParser({ htmlEntities: true, processEntities: true }).parse(html));

afterAll(() => {
  for (const r of runs) rmSync(r.dir, { recursive: true, force: true });
});

describe('report of a simulated run', () => {
  it('demo-low-q, 20 minutes: every section, seven drawn figures, numbers equal to the JSON ones, well-formed', async () => {
    const run = await simulatedRun('demo-low-q', 5, 1200);
    runs.push(run);
    const html = renderReport(run.result, run.meta);
    expect(XMLValidator.validate(html)).toBe(true);
    for (const id of SECTIONS) expect(html.includes(`id="${id}"`), id).toBe(true);
    expect(html.includes('class="nodata"')).toBe(false);
    expect(html.match(/class="chart"/g)).toHaveLength(8);
    // What `analyze --json` prints is this result through JSON; every number shown must round from it.
    const json = JSON.parse(JSON.stringify(run.result)) as Record<string, unknown>;
    expect(expectReportMatchesJson(html, json)).toBeGreaterThan(35);
    expect(html).toContain(run.meta.journalSha256);
    const page = text(html);
    for (const w of run.result.warnings) expect(page).toContain(JSON.stringify(warningText(w)).slice(1, -1));
    for (const c of run.result.corrections) expect(page).toContain(JSON.stringify(c.name).slice(1, -1));
  });

  it('a 3 s run (one period) still gives a report that says which results are missing and why', async () => {
    const run = await simulatedRun('demo-low-q', 3, 3);
    runs.push(run);
    expect(run.result.B).toBeNull();
    const html = renderReport(run.result, run.meta);
    expect(XMLValidator.validate(html)).toBe(true);
    for (const id of [...SECTIONS, 'missing']) expect(html.includes(`id="${id}"`), id).toBe(true);
    expect(html).toContain('B and C: the fit of period against amplitude needs periods over a range of amplitudes');
    expect(html).toContain('Damping and Q: need amplitudes over enough swings');
    expect(html).toContain('No plot');
    const page = text(html);
    for (const w of run.result.warnings) expect(page).toContain(JSON.stringify(warningText(w)).slice(1, -1));
    expectReportMatchesJson(html, JSON.parse(JSON.stringify(run.result)));
  });

  it('a run with no valid pass at all: no charts, every figure says what it needs, T0 explains the count', async () => {
    const run = await simulatedRun('demo-low-q', 3, 1.5);
    runs.push(run);
    expect(run.result.passes).toBe(0);
    const html = renderReport(run.result, run.meta);
    expect(XMLValidator.validate(html)).toBe(true);
    expect(html.includes('class="chart"')).toBe(false);
    expect(html.match(/class="nodata"/g)!.length).toBeGreaterThanOrEqual(6);
    expect(html).toContain('T0: needs full periods from every second pass; this journal gave 0 valid passes and 0 periods.');
    expect(html).toContain('id="notes"'); // the nominal-clock method note
  });
});
