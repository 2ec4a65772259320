import { describe, expect, it } from 'vitest';
import { XMLValidator } from 'fast-xml-parser';
import { renderChart } from '../../host/report/svg/chart.ts';
import { band, linePath, markers } from '../../host/report/svg/elements.ts';

describe('svg elements', () => {
  it('a line breaks at a missing point instead of joining across it', () => {
    expect(linePath([[0, 0], [1, 1], null, [3, 3], [4, 4]], { cls: 'ln' })).toBe('<path class="ln" d="M0 0L1 1M3 3L4 4" fill="none"/>');
    expect(linePath([null, null], { cls: 'ln' })).toBe('');
  });

  it('markers of one series are one path; every shape is closed or crossed at its centre', () => {
    const m = markers([[10, 10], [20, 20]], 'square', 2, 'mk');
    expect(m).toBe('<path class="mk" d="M8 8h4v4h-4ZM18 18h4v4h-4Z"/>');
    for (const shape of ['circle', 'triangle', 'diamond', 'cross'] as const) expect(XMLValidator.validate(`<svg>${markers([[5, 5]], shape, 3, 'mk')}</svg>`)).toBe(true);
  });

  it('a band runs along the upper edge and back along the lower one', () => {
    expect(band([[0, 1], [2, 1]], [[0, 3], [2, 3]], 'bd')).toBe('<path class="bd" d="M0 1L2 1L2 3L0 3Z"/>');
  });
});

describe('chart', () => {
  const svg = renderChart({
    id: 'c1',
    title: 'T & <x>',
    xLabel: 'x (s)',
    width: 600,
    plotHeight: 200,
    panels: [
      { yLabel: 'y (m)', series: [{ kind: 'points', label: 'data', x: [0, 5, 10], y: [0, 50, 100], shape: 'circle', tone: 1 }] },
      { yLabel: 'r', yScale: 'log', series: [{ kind: 'line', label: 'fit', x: [0, 5, 10], y: [1, 0, 100], tone: 2 }] },
    ],
  });

  it('is well-formed, titled (escaped) and has one clip path per panel with ids from the chart id', () => {
    expect(XMLValidator.validate(svg)).toBe(true);
    expect(svg).toContain('<title>T &amp; &lt;x&gt;</title>');
    expect(svg.match(/<clipPath id="c1-clip\d+m?"/g)).toEqual(['<clipPath id="c1-clip0"', '<clipPath id="c1-clip0m"', '<clipPath id="c1-clip1"', '<clipPath id="c1-clip1m"']);
  });

  it('maps data onto the plot area: x from the left margin to the right one, y upwards', () => {
    // Left margin 80 px, right margin 18 px: x = 0 → 80, x = 10 → 582; panel 0 spans y 34 … 126 (legend row above).
    // The first marker path is the legend's sample; the second is the data (marker radius 2.6 px).
    const paths = [...svg.matchAll(/<path class="mk t1" d="([^"]+)"/g)].map((m) => m[1]!);
    const xs = [...paths[1]!.matchAll(/M([\d.]+) /g)].map((m) => Number(m[1]) + 2.6);
    expect(xs[0]).toBeCloseTo(80, 6);
    expect(xs[1]).toBeCloseTo(331, 6);
    expect(xs[2]).toBeCloseTo(582, 6);
    const ticks = [...svg.matchAll(/<text class="tick" x="74" y="([\d.]+)"[^>]*>(\d+)<\/text>/g)].slice(0, 6).map((m) => [Number(m[1]), m[2]]);
    expect(ticks[0]![1]).toBe('0');
    expect(ticks.at(-1)![1]).toBe('100');
    expect(ticks[0]![0] as number).toBeGreaterThan(ticks.at(-1)![0] as number);
  });

  it('drops a zero on a log axis (a gap, not a crash) and labels both axes and the legend', () => {
    expect(svg).toMatch(/<path class="ln t2" d="M[\d.]+ [\d.]+M[\d.]+ [\d.]+" fill="none"\/>/);
    for (const t of ['x (s)', 'y (m)', '>r<', '>data<', '>fit<']) expect(svg).toContain(t);
  });
});
