import { describe, expect, it } from 'vitest';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { renderReport, type ReportMeta } from '../../host/report/index.ts';
import { EMPTY_RESULT, type AnalysisResult } from '../../host/analysis/result.ts';
import { syntheticResult, syntheticRig } from './fixture-result.ts';
import { expectReportMatchesJson } from './report-numbers.ts';
import { roundAtK } from '../../host/output/value-u.ts';

const meta: ReportMeta = { journalName: 'bench-a.journal', journalSha256: 'c0ffee'.padEnd(64, '0'), rig: syntheticRig, csvName: 'bench-a.csv' };

const SECTIONS = ['run', 'rig', 'result', 'details', 'plots', 'fig-period', 'fig-amplitude', 'fig-q', 'fig-alternation', 'fig-clock', 'fig-g', 'budget', 'corrections', 'counts', 'warnings', 'footer'];

/** A result of a run too short for any fit: two passes, nothing computed. */
function tooShort(): AnalysisResult {
  return { ...EMPTY_RESULT, clock_source: 'host', passes: 2, run: syntheticResult().run, warnings: [{ kind: 'no-full-period' }] };
}

describe('report page', () => {
  const html = renderReport(syntheticResult(), meta);

  it('is well-formed XML (XHTML-compatible) and needs no script or network', () => {
    expect(XMLValidator.validate(html)).toBe(true);
    expect(html).not.toMatch(/<script|<link|<img|<iframe|@import|url\((?!#)/i);
    // The only URLs are XML namespace names, which are never fetched.
    const urls = [...html.matchAll(/https?:\/\/[^\s"'<]+/g)].map((m) => m[0]);
    expect(new Set(urls)).toEqual(new Set(['http://www.w3.org/1999/xhtml', 'http://www.w3.org/2000/svg']));
  });

  it('has every section, seven figures (the fixture has no reduced-period series: that one says so) and seven charts (amplitude twice: linear and log)', () => {
    for (const id of SECTIONS) expect(html, id).toContain(`id="${id}"`);
    expect(html.match(/<figure /g)).toHaveLength(7);
    expect(html.match(/<svg xmlns="http:\/\/www.w3.org\/2000\/svg" class="chart"/g)).toHaveLength(7);
    expect(html).toContain('<a href="./bench-a.csv"');
    const targets = [...html.matchAll(/href="#([^"]+)"/g)].map((m) => m[1]!);
    expect(targets.length).toBeGreaterThanOrEqual(7);
    for (const t of targets) expect(html.includes(`id="${t}"`), `link target #${t}`).toBe(true);
    expect(html).not.toContain('id="missing"');
  });

  it('shows the same numbers as the JSON of the same result, to the precision shown', () => {
    const json = JSON.parse(JSON.stringify(syntheticResult())) as Record<string, unknown>;
    expect(expectReportMatchesJson(html, json)).toBeGreaterThan(30);
  });

  it('the headline: T0 and g ± u labelled k = 1, the expanded U labelled k = 2 and rounded by the same rule (#14 item 8)', () => {
    // Fixture: g_u = 0.00123 m/s², so U = 0.00246 → 0.0025 and g at the fourth decimal; u → 0.0012 at the fourth too.
    const r = syntheticResult();
    const box = /<section class="result" id="result">.*?<\/section>/.exec(html)![0];
    const text = box.replace(/<[^>]+>/g, '');
    const g1 = roundAtK(r.g_m_s2!, r.g_u_m_s2, 1);
    const g2 = roundAtK(r.g_m_s2!, r.g_u_m_s2, 2);
    expect(g2.u).toBe('0.0025');
    expect(text).toContain(`${g1.value} ± ${g1.u} m/s² (k = 1)`);
    expect(text).toContain(`expanded: ${g2.value} ± ${g2.u} m/s² (k = 2)`);
    const t0 = roundAtK(r.T0_s!, r.T0_u_s, 1);
    expect(text).toContain(`${t0.value} ± ${t0.u} s (k = 1)`);
    // Every ± in the big figures says its k: no bare 2u beside a k = 1 value.
    for (const dd of box.match(/<div class="big">.*?<\/div>/g)!) {
      const t = dd.replace(/<[^>]+>/g, '');
      expect(t.match(/±/g)!.length, t).toBe(t.match(/k = [12]/g)!.length);
    }
  });

  it('escapes every string from the journal and the rig', () => {
    const evil = '<script>alert(1)</script> & "q" \u0007';
    const r = syntheticResult({ warnings: [{ kind: 'rig-line-unusable', detail: `warn ${evil}` }], run: { ...syntheticResult().run, source: `src ${evil}`, firmware: `fw ${evil}` } });
    const page = renderReport(r, { ...meta, journalName: `j ${evil}`, rig: { ...syntheticRig, name: `rig ${evil}` }, csvName: `c ${evil}.csv` });
    expect(XMLValidator.validate(page)).toBe(true);
    expect(page).not.toContain('<script>');
    expect(renderReport(r, { ...meta, csvName: 'javascript:alert(1) #x.csv' })).toContain('<a href="./javascript%3Aalert(1)%20%23x.csv"');
    const text = JSON.stringify(new XMLParser({ htmlEntities: true, processEntities: true }).parse(page));
    for (const p of ['warn', 'src', 'fw', 'rig', 'j']) expect(text).toContain(`${p} <script>alert(1)</script> & \\"q\\" \ufffd`);
  });

  it('a run too short for any fit still gives a valid page that says what is missing', () => {
    const r = tooShort();
    const page = renderReport(r, meta);
    expect(XMLValidator.validate(page)).toBe(true);
    for (const id of SECTIONS) expect(page, id).toContain(`id="${id}"`);
    expect(page).toContain('id="missing"');
    expect(page).toContain('T0: needs full periods from every second pass; this journal gave 2 valid passes and 0 periods.');
    expect(page).toContain('B and C:');
    expect(page.match(/class="nodata"/g)!.length).toBeGreaterThanOrEqual(6);
    expect(page).not.toContain('class="chart"');
    expect(page).toContain('fewer than three passes in a row: no full period yet');
    expectReportMatchesJson(page, JSON.parse(JSON.stringify(r)));
  });

  it('without a rig it says which file to give', () => {
    const page = renderReport(tooShort(), { ...meta, rig: null, csvName: null });
    expect(page).toContain('No rig description');
    expect(page).toContain('--csv FILE');
    expect(XMLValidator.validate(page)).toBe(true);
  });
});

describe('notes', () => {
  it('a large release angle brings the exact-law note; 1.7 % at 30°', () => {
    // 2K(sin 15°)/π = 1.017408, from K(15°) = 1.5981420021 (Abramowitz & Stegun Table 17.5, recalled from memory).
    const page = renderReport(syntheticResult({}, 300, 30), meta);
    expect(page.includes('at 30.0° the period is 1.7 % longer')).toBe(true);
    expect(page.includes('<li class="note-safety"')).toBe(false);
  });

  it('a release beyond 45° adds the safety caution with the speed at the bottom', () => {
    const r = syntheticResult({}, 100, 60);
    const page = renderReport(r, meta);
    // v = √(2gL(1 − cos 60°)) = √(9.81) ≈ 3.1 m/s for L = 1 m (energy conservation).
    expect(page).toContain('passes the gate at about 3.1 m/s');
    expect(page).toContain('qualified supervision');
  });

  it('small amplitudes and a centred gate bring no notes at all', () => {
    const page = renderReport(syntheticResult({ gate_offset_m: 0.0002 }, 300, 8), meta);
    expect(page.includes('id="notes"')).toBe(false);
  });
});
