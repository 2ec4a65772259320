// Screen geometry and status-line fitting.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { fitItems, layoutFor } from '../../host/tui/layout.ts';

const width = (items: { label: string; value: string }[]): number => items.reduce((w, it, i) => w + (i ? 3 : 0) + it.label.length + 1 + [...it.value].length, 0);

describe('layout', () => {
  it('never goes below 80×24 and keeps a spare line', () => {
    const l = layoutFor(undefined, undefined);
    expect([l.width, l.height]).toEqual([80, 23]);
    expect(l.numbersWidth + 1 + l.plotWidth).toBe(80);
    const big = layoutFor(160, 50);
    expect(big.height).toBe(49);
    expect(big.chartHeight).toBeGreaterThan(l.chartHeight);
  });
});

describe('fitItems', () => {
  it('shortens a path from its beginning and keeps the rest whole', () => {
    const items = [
      { label: 'link', value: 'reconnecting (try 3)' },
      { label: 'journal', value: '/var/lib/halfswing/runs/2026-01-05-night.journal (12.3 MB)', shrink: true },
    ];
    const out = fitItems(items, 60);
    expect(width(out)).toBeLessThanOrEqual(60);
    expect(out[0]!.value).toBe('reconnecting (try 3)');
    expect(out[1]!.value.startsWith('…')).toBe(true);
    expect(out[1]!.value.endsWith('night.journal (12.3 MB)')).toBe(true);
  });

  it('takes the short wordings first, then drops the items marked to go first, keeping the run time', () => {
    const items = [
      { label: 'mode', value: 'ended: recording ended 2026-01-05 09:03:20 UTC (shutdown (SIGTERM))', short: 'ended 2026-01-05 09:03:20 UTC' },
      { label: 'clock', value: 'nominal (±2887 ppm), host fit at 5:01', short: 'nominal (±2887 ppm)', dropFirst: true },
      { label: 'run', value: '3:20' },
    ];
    expect(fitItems(items, 62).map((i) => `${i.label} ${i.value}`)).toEqual(['mode ended 2026-01-05 09:03:20 UTC', 'run 3:20']);
    expect(fitItems(items, 80).map((i) => i.value)).toEqual(['ended 2026-01-05 09:03:20 UTC', 'nominal (±2887 ppm)', '3:20']);
    expect(fitItems(items, 200).map((i) => i.value)).toEqual(items.map((i) => i.value));
  });

  it('always fits, whatever the items', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ label: fc.string({ minLength: 1, maxLength: 8 }), value: fc.string({ maxLength: 60 }), shrink: fc.boolean(), short: fc.option(fc.string({ maxLength: 60 }), { nil: undefined }), dropFirst: fc.boolean() }), { maxLength: 8 }),
        fc.integer({ min: 10, max: 120 }),
        (items, w) => {
          expect(width(fitItems(items, w))).toBeLessThanOrEqual(w);
        },
      ),
    );
  });
});
