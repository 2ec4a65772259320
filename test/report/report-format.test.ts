import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { duration, sig, valueU } from '../../host/report/format.ts';
import { decimalsForU as decimalsFor } from '../../host/output/value-u.ts';
import { parseShown } from './report-numbers.ts';

const num = (s: string): number => Number(s.replace('\u2212', '-'));

describe('value ± uncertainty', () => {
  it('rounds like the GUM example: m = 100.02147 g with u = 0.35 mg (JCGM 100:2008, 7.2.2)', () => {
    expect(valueU(100.02147, 0.00035)).toEqual({ value: '100.02147', u: '0.00035' });
  });

  it('quotes the uncertainty to two significant figures (JCGM 100:2008, 7.2.6) and the value to the same place', () => {
    expect(valueU(9.801234, 0.001234)).toEqual({ value: '9.8012', u: '0.0012' });
    expect(valueU(-1234.5678, 0.81)).toEqual({ value: '\u22121234.57', u: '0.81' });
    expect(valueU(2.0060713, 3.1e-6)).toEqual({ value: '2.0060713', u: '0.0000031' });
    expect(valueU(12345.6, 123)).toEqual({ value: '12350', u: '120' });
    expect(valueU(1.2401e18, 2.5e17)).toEqual({ value: '1.24e18', u: '0.25e18' });
    expect(sig(793949040754908288, 3)).toBe('7.94e17');
  });

  it('for any value and uncertainty, the shown value is within half a unit of its last place and u has two figures', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e5, max: 1e5, noNaN: true }), fc.double({ min: 1e-9, max: 1e5, noNaN: true }), (v, u) => {
        const f = valueU(v, u);
        const d = decimalsFor(u);
        const ulp = 10 ** -d; // may exceed 1 when u is large (rounding to tens)
        expect(Math.abs(num(f.value) - v)).toBeLessThanOrEqual(ulp / 2 + 1e-9 * Math.abs(v));
        expect(Math.abs(num(f.u!) - u)).toBeLessThanOrEqual(ulp / 2 + 1e-12);
        // Two significant figures; a carry (0.995 → 1.0) or rounding to tens (123 → 120) adds trailing zeros only.
        const digits = f.u!.replace(/^[0.]+/, '').replace('.', '');
        expect(digits.replace(/0+$/, '').length).toBeLessThanOrEqual(2);
        expect(digits.length).toBeGreaterThanOrEqual(2);
      }),
    );
  });

  it('from a million up, value and uncertainty share a power of ten and still round from the input', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e20, max: 1e20, noNaN: true }), fc.double({ min: 1e6, max: 1e20, noNaN: true }), (v, u) => {
        const f = valueU(v, u);
        const a = parseShown(f.value);
        const b = parseShown(f.u!);
        expect(Math.abs(a.value - v)).toBeLessThanOrEqual(a.halfUlp * (1 + 1e-9) + Math.abs(v) * 1e-15);
        expect(Math.abs(b.value - u)).toBeLessThanOrEqual(b.halfUlp * (1 + 1e-9) + u * 1e-15);
      }),
    );
  });

  it('shows a value alone (six figures) when there is no uncertainty', () => {
    expect(valueU(9.8123456, null)).toEqual({ value: '9.81235', u: null });
    expect(sig(-0.000123456, 3)).toBe('\u22120.000123');
  });

  it('writes durations in h, min, s', () => {
    expect(duration(12.34)).toBe('12.3 s');
    expect(duration(245)).toBe('4 min 05 s');
    expect(duration(7384.4)).toBe('2 h 03 min 04 s');
  });
});
