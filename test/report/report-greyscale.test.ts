import { describe, expect, it } from 'vitest';
import { STYLES } from '../../host/report/styles.ts';
import { renderReport } from '../../host/report/index.ts';
import { rmSync } from 'node:fs';
import { syntheticResult, syntheticRig } from './fixture-result.ts';
import { simulatedRun } from './sim-run.ts';

// Greyscale print: luma Y' = 0.299 R + 0.587 G + 0.114 B (ITU-R BT.601). A gap of 20 levels of 255 between
// tones is a rule of thumb for telling printed greys apart (common practice, no source).
const luma = (hex: string): number => {
  const n = parseInt(hex.slice(1), 16);
  return 0.299 * (n >> 16) + 0.587 * ((n >> 8) & 255) + 0.114 * (n & 255);
};

describe('the report reads in greyscale', () => {
  it('the four series tones are distinct greys, all darker than the page', () => {
    const tones = [1, 2, 3, 4].map((i) => new RegExp(`--t${i}:(#[0-9a-f]{6})`).exec(STYLES)![1]!).map(luma);
    for (let i = 0; i < tones.length; i++) {
      expect(tones[i]!).toBeLessThan(200);
      for (let j = i + 1; j < tones.length; j++) expect(Math.abs(tones[i]! - tones[j]!), `t${i + 1} vs t${j + 1}`).toBeGreaterThanOrEqual(20);
    }
  });

  it('within each chart, series differ by marker shape or dash pattern, not by colour alone', async () => {
    const run = await simulatedRun('demo-low-q', 2, 1200);
    rmSync(run.dir, { recursive: true, force: true });
    const pages = [renderReport(syntheticResult(), { journalName: 'j', journalSha256: '0'.repeat(64), rig: syntheticRig, csvName: null }), renderReport(run.result, run.meta)];
    for (const html of pages) checkLegends(html);
  });
});

/** Every chart's legend samples are pairwise different without colour. */
function checkLegends(html: string): void {
  for (const svg of html.match(/<svg xmlns="http:\/\/www.w3.org\/2000\/svg" class="chart"[\s\S]*?<\/svg>/g)!) {
    const legend = /<g class="legend">([\s\S]*?)<\/g>/.exec(svg)?.[1] ?? '';
    // A legend sample is a marker path (its d string encodes the shape), a dashed or solid line, or a band.
    const samples = [...legend.matchAll(/<(path|line|rect) class="(mk|ln|bd) t\d"([^>]*)\/>/g)].map((m) =>
      m[2] === 'mk' ? `marker:${m[3]!.replace(/[\d.\-]+/g, '#')}` : m[2] === 'ln' ? `line:${/stroke-dasharray="([^"]+)"/.exec(m[3]!)?.[1] ?? 'solid'}` : 'band',
    );
    expect(samples.length, svg.slice(0, 120)).toBeGreaterThan(0);
    expect(new Set(samples).size, svg.slice(0, 120)).toBe(samples.length);
  }
}
