// The text chart: fixed size, ticks on nice values at the right place, axis titles, empty text, series drawn where they belong.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { chartText, renderChart } from '../../host/tui/plot/chart.ts';
import { niceStep, niceTicks, dataRange } from '../../host/tui/plot/ticks.ts';

const width = (s: string): number => [...s].length;

describe('nice ticks', () => {
  it('steps are 1, 2 or 5 × 10^k and cover at least the rough step', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1e9, noNaN: true }), (rough) => {
        const s = niceStep(rough);
        expect(s).toBeGreaterThanOrEqual(rough * (1 - 1e-9));
        expect(s).toBeLessThan(rough * 5.0001);
        const mant = s / 10 ** Math.floor(Math.log10(s) + 1e-12);
        expect([1, 2, 5, 10].some((m) => Math.abs(mant - m) < 1e-6)).toBe(true);
      }),
    );
  });

  it('puts every tick inside the range on a multiple of the step', () => {
    const t = niceTicks({ min: 1.31, max: 25.69 }, 5);
    expect(t.values).toEqual([5, 10, 15, 20, 25]);
    expect(t.decimals).toBe(0);
    const p = niceTicks({ min: 2.0061, max: 2.0243 }, 4);
    expect(p.values.map((v) => v.toFixed(p.decimals))).toEqual(['2.010', '2.015', '2.020']);
  });

  it('widens a single value and ignores non-finite values', () => {
    expect(dataRange([])).toBeNull();
    const r = dataRange([2, NaN, Infinity])!;
    expect(r.min).toBeLessThan(2);
    expect(r.max).toBeGreaterThan(2);
    const m = dataRange([5, 5.001], 0, 1)!;
    expect(m.max - m.min).toBeCloseTo(1, 12);
  });
});

describe('renderChart', () => {
  const spec = {
    width: 40,
    height: 10,
    x: { label: 'amplitude (°)', tickSuffix: '°' },
    y: { label: 'period (s)' },
    series: [{ xs: [0, 10, 20], ys: [1, 2, 3], style: 'line' as const, tone: 'fit' }],
  };

  it('is exactly height lines of exactly width characters, for any size', () => {
    fc.assert(
      fc.property(fc.integer({ min: 16, max: 200 }), fc.integer({ min: 4, max: 60 }), (w, h) => {
        const lines = renderChart({ ...spec, width: w, height: h });
        expect(lines).toHaveLength(h);
        for (const l of lines) expect(width(l.map((r) => r.text).join(''))).toBe(w);
      }),
    );
  });

  it('writes both axis titles with their units', () => {
    const text = chartText(renderChart(spec));
    expect(text.split('\n')[0]).toMatch(/^period \(s\)/);
    expect(text.split('\n')[9]).toMatch(/amplitude \(°\)$/);
  });

  it('labels y ticks on the rows where those values fall', () => {
    const lines = chartText(renderChart({ ...spec, y: { label: 'y', range: { min: 0, max: 4 } }, height: 11 })).split('\n');
    // 8 plot rows (32 dots) for 0..4: the value 4 is on the top row, 0 on the bottom row.
    expect(lines[1]).toMatch(/^4┤/);
    expect(lines[8]).toMatch(/^0┤/);
  });

  it('draws a rising line from the bottom-left to the top-right corner', () => {
    const lines = renderChart({ ...spec, x: { label: 'x', range: { min: 0, max: 20 } }, y: { label: 'y', range: { min: 1, max: 3 } } });
    const rows = lines.slice(1, 8).map((l) => l.slice(2).map((r) => r.text).join(''));
    const first = rows.map((r) => [...r].findIndex((ch) => ch !== ' ' && ch !== '\u2800'));
    expect(first[first.length - 1]).toBe(0);
    expect(first[0]!).toBeGreaterThan(first[first.length - 1]!);
    expect(lines.slice(1, 8).flat().some((r) => r.tone === 'fit')).toBe(true);
  });

  it('shows the empty text when there is nothing to draw', () => {
    const text = chartText(renderChart({ ...spec, series: [], emptyText: 'waiting for swings' }));
    expect(text).toContain('waiting for swings');
  });

  it('marks x ticks with ┬ under their values', () => {
    const lines = chartText(renderChart({ ...spec, width: 60, x: { label: 't (s)', range: { min: 0, max: 100 } } })).split('\n');
    const axis = lines[8]!;
    const under = lines[9]!;
    for (const v of ['0', '20', '40']) {
      const at = under.indexOf(v === '0' ? '0 ' : v);
      expect(at).toBeGreaterThanOrEqual(0);
      const mid = at + Math.floor(v.length / 2);
      expect(axis.slice(mid - 1, mid + 2)).toContain('┬');
    }
  });
});
