// The one rounding of "value ± standard uncertainty" for every view (summary, live view, report).
//
// Rule (GUM, JCGM 100:2008 §7.2.6): the uncertainty u to two significant digits, the value rounded at the same
// decimal place; from u ≥ 10 that place is left of the point (6012 ± 312 → 6010 ± 310). From a million up both
// share a power of ten (1.24e18 ± 0.31e18). Without a usable u, the value alone to `sigWithout` significant digits.
// Coverage: every view shows the standard uncertainty u (k = 1); where it also shows the expanded uncertainty
// U = 2u, that is labelled k = 2 and rounded by the same rule (U to two digits, the value at U's place), through
// `roundAtK` and `quoteU` below, never by a caller's own toFixed/toPrecision. An uncertainty shown alone (`uAlone`)
// gets the same two digits.

/** From here up, digits stop being readable: value and u get a shared power of ten. */
const BIG = 1e6;

/** Decimal places that show `u` to two significant digits (negative: round to tens, hundreds…). */
export function decimalsForU(u: number): number {
  if (!(u > 0) || !Number.isFinite(u)) return 0;
  const d = 1 - Math.floor(Math.log10(u));
  // A carry to a third digit (0.0998 → 0.100) moves the place one left: two digits, 0.10.
  return Math.round(u * 10 ** d) >= 100 ? d - 1 : d;
}

/** `v` with `d` ≥ 0 decimals, "-0" shown as "0". */
function fixedPlain(v: number, d: number): string {
  const s = v.toFixed(Math.min(d, 20));
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** `v` rounded at `d` decimals where d may be negative (d = −1 rounds to tens). */
function atPlace(v: number, d: number): string {
  return d >= 0 ? fixedPlain(v, d) : fixedPlain(Math.round(v / 10 ** -d) * 10 ** -d, 0);
}

/** `v` to `n` significant digits: plain decimals, or "1.24e18" from a million up. */
export function significant(v: number, n: number): string {
  if (v === 0 || !Number.isFinite(v)) return Number.isFinite(v) ? '0' : '—';
  if (Math.abs(v) >= BIG) return v.toExponential(n - 1).replace('e+', 'e');
  return fixedPlain(v, Math.max(0, n - 1 - Math.floor(Math.log10(Math.abs(v)))));
}

/** Value and standard uncertainty rounded together (ASCII minus; u null when not usable). */
export function roundWithU(v: number, u: number | null | undefined, sigWithout = 6): { value: string; u: string | null } {
  if (u === null || u === undefined || !(u > 0) || !Number.isFinite(u)) return { value: significant(v, sigWithout), u: null };
  if (u >= BIG) {
    const e = Math.floor(Math.log10(Math.max(Math.abs(v), u)));
    const k = 10 ** e;
    const d = Math.max(0, decimalsForU(u / k));
    return { value: `${fixedPlain(v / k, d)}e${e}`, u: `${fixedPlain(u / k, d)}e${e}` };
  }
  const d = decimalsForU(u);
  return { value: atPlace(v, d), u: atPlace(u, d) };
}

/** "value ± u unit" (or the value alone without u; "—" without a value). */
export function plusMinus(v: number | null | undefined, u: number | null | undefined, unit = '', sigWithout = 6): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const r = roundWithU(v, u, sigWithout);
  return `${r.value}${r.u !== null ? ` ± ${r.u}` : ''}${unit}`;
}

/** An uncertainty shown without its value ("1.2 µs" of a pivot's period): two significant digits by the same rule. */
export function uAlone(u: number, unit = ''): string {
  return `${roundWithU(u, u).u ?? significant(u, 2)}${unit}`;
}

/** Coverage factor of a shown uncertainty: 1 for the standard uncertainty u, 2 for the expanded U = 2u. */
export type Coverage = 1 | 2;

const usable = (u: number | null | undefined): u is number => u !== null && u !== undefined && u > 0 && Number.isFinite(u);

/** Value and k·u rounded together by the rule above (k = 2: U gets its own two digits, the value U's place). */
export function roundAtK(v: number, u: number | null | undefined, k: Coverage, sigWithout = 6): { value: string; u: string | null } {
  return roundWithU(v, usable(u) ? k * u : null, sigWithout);
}

/**
 * The labelled form for a headline figure: "9.81272 ± 0.00056 m/s² (k = 1)", with `expanded` followed by
 * "; expanded 9.8127 ± 0.0011 m/s² (k = 2)". Without a usable u the value alone, unlabelled.
 */
export function quoteU(v: number | null | undefined, u: number | null | undefined, unit = '', opts: { readonly expanded?: boolean } = {}): string {
  const one = plusMinus(v, u, unit);
  if (v === null || v === undefined || !Number.isFinite(v) || !usable(u)) return one;
  const U = roundAtK(v, u, 2);
  return `${one} (k = 1)${opts.expanded ? `; expanded ${U.value} ± ${U.u}${unit} (k = 2)` : ''}`;
}
