// Renders the report of a simulated run in headless Chromium: screenshot, layout probe, strict XHTML parse, print.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderReport } from '../../host/report/index.ts';
import { findChromium, runChromium } from './chromium.ts';
import { decodePng, inkFraction } from './png-decode.ts';
import { simulatedRun, type SimRun } from './sim-run.ts';

const ARTIFACTS = fileURLToPath(new URL('../artifacts/', import.meta.url));
const bin = findChromium();
const ci = process.env.CI === 'true';
if (!bin && !ci) console.log('report rendering tests skipped: no chromium (install it: apt-get install chromium)');

interface Probe {
  readonly docWidth: number;
  readonly viewWidth: number;
  readonly docHeight: number;
  readonly charts: { fig: string; w: number; h: number; shown: boolean }[];
  readonly sections: Record<string, { top: number; h: number }>;
  /** Whether each amplitude chart (linear, log) has size after the log-axis box is ticked. */
  readonly afterToggle: boolean[];
}

// Test-only: measures the laid-out page and writes the numbers into the DOM for --dump-dom (base64, so no
// escaping question). The shipped report has no script; this is appended to a copy.
const PROBE = `<script>//<![CDATA[
addEventListener('load', () => {
  const charts = [...document.querySelectorAll('svg.chart')].map((s) => {
    const r = s.getBoundingClientRect();
    return { fig: s.closest('figure') ? s.closest('figure').id : '', w: r.width, h: r.height, shown: getComputedStyle(s.parentElement).display !== 'none' };
  });
  const sections = {};
  for (const el of document.querySelectorAll('section[id], figure[id], footer[id]')) {
    const r = el.getBoundingClientRect();
    sections[el.id] = { top: r.top + scrollY, h: r.height };
  }
  // The log-axis option is CSS only: ticking the box must swap the two amplitude drawings.
  const box = document.getElementById('amp-log-toggle');
  box.checked = true;
  const afterToggle = [...document.querySelectorAll('#fig-amplitude svg.chart')].map((s) => s.getBoundingClientRect().height > 0);
  const out = { docWidth: document.documentElement.scrollWidth, viewWidth: innerWidth, docHeight: document.documentElement.scrollHeight, charts, sections, afterToggle };
  const pre = document.createElement('pre');
  pre.id = 'probe';
  pre.textContent = btoa(unescape(encodeURIComponent(JSON.stringify(out))));
  document.body.appendChild(pre);
});
//]]></script>`;

describe.skipIf(!bin && !ci)('report in headless Chromium (simulated demo-low-q run)', () => {
  let run: SimRun;
  let html: string;
  let page: string;
  beforeAll(async () => {
    if (!bin) throw new Error('CI=true but chromium is not installed: apt-get install chromium');
    run = await simulatedRun('demo-low-q', 11, 1200);
    html = renderReport(run.result, run.meta);
    page = join(run.dir, 'report.html');
    writeFileSync(page, html);
    mkdirSync(ARTIFACTS, { recursive: true });
  });
  afterAll(() => {
    if (run) rmSync(run.dir, { recursive: true, force: true });
  });

  /** Loads a copy of the page with the probe at a window width and returns what it measured. */
  async function probeAt(width: number): Promise<Probe> {
    const probePage = join(run.dir, `probe-${width}.html`);
    writeFileSync(probePage, html.replace('</body>', `${PROBE}</body>`));
    const dom = await runChromium(bin!, probePage, [`--window-size=${width},1600`, '--dump-dom', '--virtual-time-budget=5000']);
    const b64 = /<pre id="probe">([A-Za-z0-9+/=]+)<\/pre>/.exec(dom);
    expect(b64, 'the probe ran').not.toBeNull();
    return JSON.parse(Buffer.from(b64![1]!, 'base64').toString('utf8')) as Probe;
  }

  it('lays out: no horizontal overflow, every chart visible with size, sections in order', async () => {
    const probe = await probeAt(1200);
    expect(probe.docWidth).toBeLessThanOrEqual(probe.viewWidth);
    expect(probe.charts).toHaveLength(8);
    const shown = probe.charts.filter((c) => c.shown);
    expect(shown.map((c) => c.fig)).toEqual(['fig-period', 'fig-amplitude', 'fig-q', 'fig-alternation', 'fig-clock', 'fig-g', 'fig-t0-time']);
    for (const c of shown) {
      expect(c.w, c.fig).toBeGreaterThan(600);
      expect(c.h, c.fig).toBeGreaterThan(200);
    }
    const order = ['run', 'result', 'details', 'fig-period', 'fig-g', 'budget', 'corrections', 'counts', 'warnings', 'footer'];
    const tops = order.map((id) => probe.sections[id]?.top ?? NaN);
    for (let i = 1; i < tops.length; i++) expect(tops[i]!, order[i]).toBeGreaterThan(tops[i - 1]!);
    for (const id of order) expect(probe.sections[id]!.h, id).toBeGreaterThan(20);
    expect(probe.charts.filter((c) => c.fig === 'fig-amplitude').map((c) => c.shown)).toEqual([true, false]);
    expect(probe.afterToggle).toEqual([false, true]);
    writeFileSync(join(ARTIFACTS, 'report-demo-low-q.layout.json'), JSON.stringify(probe, null, 1));
  });

  it('fits a 700 px column (about the printable width of A4 and Letter at 96 px/in) without overflow', async () => {
    const probe = await probeAt(700);
    expect(probe.viewWidth).toBe(700);
    expect(probe.docWidth).toBeLessThanOrEqual(700);
    for (const c of probe.charts.filter((x) => x.shown)) expect(c.w, c.fig).toBeGreaterThan(550);
  });

  it('screenshots to a PNG that is not blank and has ink from top to bottom', async () => {
    const png = join(ARTIFACTS, 'report-demo-low-q.png');
    await runChromium(bin!, page, ['--window-size=1200,7000', `--screenshot=${png}`]);
    const img = decodePng(readFileSync(png));
    expect(img.width).toBe(1200);
    // Text, axes and markers: a few per cent of the page is ink; a blank or unstyled page has far less or none.
    expect(inkFraction(img)).toBeGreaterThan(0.02);
    for (let band = 0; band < 5; band++) expect(inkFraction(img, band * 1200, (band + 1) * 1200), `band ${band}`).toBeGreaterThan(0.005);
  });

  it('parses as strict XHTML (the browser XML parser reports no error)', async () => {
    const xhtml = join(run.dir, 'report.xhtml');
    copyFileSync(page, xhtml);
    const dom = await runChromium(bin!, xhtml, ['--dump-dom']);
    expect(dom.includes('parsererror')).toBe(false);
    expect(dom).toContain('id="result"');
  });

  it('prints to a PDF of several pages', async () => {
    const pdf = join(ARTIFACTS, 'report-demo-low-q.pdf');
    await runChromium(bin!, page, [`--print-to-pdf=${pdf}`, '--no-pdf-header-footer']);
    const pages = readFileSync(pdf).toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? [];
    expect(pages.length).toBeGreaterThanOrEqual(3);
    expect(pages.length).toBeLessThanOrEqual(12);
  });
});
