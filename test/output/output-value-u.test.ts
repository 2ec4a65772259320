// The one rounding of "value ± u" at k = 1 and k = 2 (host/output/value-u.ts), used by the summary, the live view and
// the report. Rule: docs/references.md#ref-uncertainty-rounding (JCGM 100:2008 §7.2.6: u to at most two significant
// digits; two digits and the value at the same place is common practice, no source).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decimalsForU, plusMinus, quoteU, roundAtK } from '../../host/output/value-u.ts';

/** Significant digits of a shown uncertainty below a million ("0.0011" → 2, "120" rounded to tens → 2). */
function digitsOf(shown: string, d: number): number {
  const plain = shown.replace('.', '').replace(/^0+/, '');
  return d >= 0 ? plain.length : plain.length - -d;
}
const decimalsOf = (s: string): number => (s.includes('.') ? s.length - s.indexOf('.') - 1 : 0);

describe('roundAtK: the standard and the expanded uncertainty by one rule', () => {
  it('worked examples: the issue’s g (u = 0.005595 m/s²) shows 9.8126 ± 0.0056 at k = 1 and 9.813 ± 0.011 at k = 2', () => {
    // Before: "± 0.0056 (k = 1; expanded k = 2: ± 0.01119)", U with four digits and the value not re-rounded.
    expect(roundAtK(9.81263, 0.005595, 1)).toEqual({ value: '9.8126', u: '0.0056' });
    expect(roundAtK(9.81263, 0.005595, 2)).toEqual({ value: '9.813', u: '0.011' });
    // T0 of the 1 m bench rig (T0 ≈ 2.006 s): u = 3.1 µs and U = 6.2 µs, both at the seventh decimal place.
    expect(roundAtK(2.0060713, 3.1e-6, 1)).toEqual({ value: '2.0060713', u: '0.0000031' });
    expect(roundAtK(2.0060713, 3.1e-6, 2)).toEqual({ value: '2.0060713', u: '0.0000062' });
    // Doubling crosses a decade: u = 0.0056 → U = 0.0112 → 0.011, one decimal fewer on the value.
    expect(roundAtK(1234.5678, 0.56, 2)).toEqual({ value: '1234.6', u: '1.1' });
    // Above 10 the place is left of the point: 6012 ± 312 → 6010 ± 310 (k = 1), U = 624 → 6010 ± 620 (k = 2).
    expect(roundAtK(6012, 312, 1)).toEqual({ value: '6010', u: '310' });
    expect(roundAtK(6012, 312, 2)).toEqual({ value: '6010', u: '620' });
  });

  it('a carry to a third digit moves the place: u = 0.0499 → U = 0.0998 shows 0.10, not 0.100', () => {
    expect(roundAtK(1.23456, 0.0499, 2)).toEqual({ value: '1.23', u: '0.10' });
    expect(roundAtK(1.23456, 0.0996, 1)).toEqual({ value: '1.23', u: '0.10' });
    expect(decimalsForU(0.0998)).toBe(2);
    expect(decimalsForU(0.0994)).toBe(3);
  });

  it('without a usable u, the value alone at either k', () => {
    for (const u of [null, undefined, 0, -1, Infinity, NaN]) {
      expect(roundAtK(9.8123456, u, 1)).toEqual({ value: '9.81235', u: null });
      expect(roundAtK(9.8123456, u, 2)).toEqual({ value: '9.81235', u: null });
    }
  });

  it('property: for any value and u, at k = 1 and 2, the shown k·u has exactly two significant digits, rounds from k·u, and the value sits at its place', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e5, max: 1e5, noNaN: true }),
        fc.double({ min: 1e-9, max: 2e5, noNaN: true }),
        fc.constantFrom(1 as const, 2 as const),
        (v, u, k) => {
          const r = roundAtK(v, u, k);
          const d = decimalsForU(k * u);
          const half = 0.5 * 10 ** -d;
          expect(digitsOf(r.u!, d)).toBe(2);
          expect(Math.abs(Number(r.u) - k * u)).toBeLessThanOrEqual(half * (1 + 1e-9));
          expect(Math.abs(Number(r.value) - v)).toBeLessThanOrEqual(half * (1 + 1e-9) + 1e-12 * Math.abs(v));
          // Same decimal place: as many decimals on the value as on U (none when rounding to tens or more).
          expect(decimalsOf(r.value)).toBe(Math.max(0, d));
          expect(decimalsOf(r.u!)).toBe(Math.max(0, d));
        },
      ),
    );
  });

  it('property: the k = 2 figure is never shown finer than the k = 1 figure, and at most one decade coarser', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e4, max: 1e4, noNaN: true }), fc.double({ min: 1e-8, max: 1e4, noNaN: true }), (v, u) => {
        const one = decimalsForU(u);
        const two = decimalsForU(2 * u);
        expect(two).toBeLessThanOrEqual(one);
        expect(one - two).toBeLessThanOrEqual(1);
      }),
    );
  });
});

describe('quoteU: the labelled headline form', () => {
  it('g with its expanded uncertainty, both labelled, the expanded one rounded by the same rule', () => {
    expect(quoteU(9.81263, 0.005595, ' m/s²', { expanded: true })).toBe('9.8126 ± 0.0056 m/s² (k = 1); expanded 9.813 ± 0.011 m/s² (k = 2)');
    expect(quoteU(2.0060713, 3.1e-6, ' s')).toBe('2.0060713 ± 0.0000031 s (k = 1)');
  });

  it('no label where no uncertainty is shown; a dash without a value', () => {
    expect(quoteU(9.8123456, null, ' m/s²', { expanded: true })).toBe('9.81235 m/s²');
    expect(quoteU(null, 0.1, ' s')).toBe('—');
  });

  it('property: the k = 1 part is plusMinus, the k = 2 part is roundAtK(…, 2), each label once', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e5, max: 1e5, noNaN: true }), fc.double({ min: 1e-9, max: 1e5, noNaN: true }), (v, u) => {
        const s = quoteU(v, u, ' s', { expanded: true });
        const U = roundAtK(v, u, 2);
        expect(s).toBe(`${plusMinus(v, u, ' s')} (k = 1); expanded ${U.value} ± ${U.u} s (k = 2)`);
        expect(s.match(/k = 1/g)).toHaveLength(1);
        expect(s.match(/k = 2/g)).toHaveLength(1);
      }),
    );
  });
});
