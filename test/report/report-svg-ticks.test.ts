import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { linearTicks, logTicks, niceDomain, niceStep, tickLabel } from '../../host/report/svg/ticks.ts';
import { linearScale, logScale } from '../../host/report/svg/scale.ts';

// "Nice" labels at 1, 2 and 5 times a power of ten: the usual graph-labelling rule (P. S. Heckbert, "Nice
// numbers for graph labels", Graphics Gems, 1990; recalled from memory). Our thresholds are the geometric
// means between neighbouring steps.
const mantissa = (step: number): number => Number((step / 10 ** Math.floor(Math.log10(step) + 1e-12)).toPrecision(6));

const span = fc.record({
  lo: fc.double({ min: -1e6, max: 1e6, noNaN: true }),
  width: fc.double({ min: 1e-6, max: 1e6, noNaN: true }),
  count: fc.integer({ min: 2, max: 10 }),
});

describe('nice ticks', () => {
  it('steps are 1, 2 or 5 times a power of ten', () => {
    fc.assert(fc.property(fc.double({ min: 1e-9, max: 1e9, noNaN: true }), fc.integer({ min: 1, max: 12 }), (s, n) => [1, 2, 5].includes(mantissa(niceStep(s, n)))));
  });

  it('picks the step nearest to span/count in ratio', () => {
    expect(niceStep(10, 5)).toBe(2);
    expect(niceStep(10, 10)).toBe(1);
    expect(niceStep(0.37, 5)).toBeCloseTo(0.1, 15); // 0.074: 0.1 is 1.35× away, 0.05 is 1.48× away
    expect(niceStep(0.33, 5)).toBeCloseTo(0.05, 15); // 0.066: 0.05 is 1.32× away, 0.1 is 1.52× away
  });

  it('a nice domain contains the data and its ends are whole steps; ticks are evenly spaced inside it', () => {
    fc.assert(
      fc.property(span, ({ lo, width, count }) => {
        const hi = lo + width;
        const [a, b] = niceDomain(lo, hi, count);
        const { ticks, step } = linearTicks(a, b, count);
        // Contains the data to rounding: ends within 1e-6 of a step are snapped, not widened by a whole step.
        expect(a).toBeLessThanOrEqual(lo + step * 1e-6);
        expect(b).toBeGreaterThanOrEqual(hi - step * 1e-6);
        expect(ticks.length).toBeGreaterThanOrEqual(2);
        expect(ticks.length).toBeLessThanOrEqual(4 * count + 2);
        for (let i = 1; i < ticks.length; i++) expect(ticks[i]! - ticks[i - 1]!).toBeCloseTo(step, 6);
        expect(ticks[0]!).toBeGreaterThanOrEqual(a - step * 1e-6);
        expect(ticks.at(-1)!).toBeLessThanOrEqual(b + step * 1e-6);
      }),
    );
  });

  it('a constant (or float-noise) span still gives a usable domain and a few ticks, without looping', () => {
    const [a, b] = niceDomain(1409.2, 1409.2 + 1e-12);
    expect(b - a).toBeGreaterThan(1);
    expect(linearTicks(a, b).ticks.length).toBeGreaterThanOrEqual(2);
    expect(niceDomain(0, 0)).toEqual([-1, 1]);
  });

  it('labels carry no float noise and use a typographic minus', () => {
    const { ticks, step } = linearTicks(0, 1, 10);
    expect(ticks.map((t) => tickLabel(t, step))).toEqual(['0.0', '0.1', '0.2', '0.3', '0.4', '0.5', '0.6', '0.7', '0.8', '0.9', '1.0']);
    expect(tickLabel(-0.004, 0.002)).toBe('\u22120.004');
    expect(tickLabel(1e-17, 0.5)).toBe('0.0');
    expect(tickLabel(2.5e17, 5e16)).toBe('2.5e17');
    expect(tickLabel(-1e18, 5e17)).toBe('\u22121e18');
    expect(tickLabel(3e6, 1e6)).toBe('3e6');
  });

  it('log ticks are 1-2-5 multiples of powers of ten inside the range', () => {
    expect(logTicks(1, 100)).toEqual([1, 2, 5, 10, 20, 50, 100]);
    expect(logTicks(0.9, 11)).toEqual([1, 2, 5, 10]);
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e6, noNaN: true }), fc.double({ min: 1.01, max: 1e6, noNaN: true }), (lo, f) => {
        for (const t of logTicks(lo, lo * f)) expect([1, 2, 3, 5]).toContain(mantissa(t));
      }),
    );
  });
});

describe('scales', () => {
  it('a linear scale maps its (nice) domain ends onto the range ends, inverted y included', () => {
    const s = linearScale([0.3, 9.7], [300, 20]);
    expect(s.domain).toEqual([0, 10]);
    expect(s.map(0)).toBe(300);
    expect(s.map(10)).toBe(20);
    expect(s.map(5)).toBe(160);
  });

  it('a log scale spaces decades evenly and refuses values it cannot draw', () => {
    const s = logScale([3, 80], [0, 300]);
    expect(s.domain).toEqual([2, 100]);
    expect(s.map(20) - s.map(2)).toBeCloseTo(s.map(100) - s.map(10), 9);
    expect(s.accepts(0)).toBe(false);
    expect(s.accepts(-1)).toBe(false);
    expect(() => logScale([0, 10], [0, 1])).toThrow(RangeError);
  });
});
