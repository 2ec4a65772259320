// The one rounding of "value ± standard uncertainty" for every view (summary, live view, report).
//
// Rule (GUM, JCGM 100:2008 §7.2.6): the uncertainty u to two significant digits, the value rounded at the same
// decimal place; from u ≥ 10 that place is left of the point (6012 ± 312 → 6010 ± 310). From a million up both
// share a power of ten (1.24e18 ± 0.31e18). Without a usable u, the value alone to `sigWithout` significant digits.
// Uncertainties are standard (k = 1) unless a caller labels them otherwise.

/** From here up, digits stop being readable: value and u get a shared power of ten. */
const BIG = 1e6;

/** Decimal places that show `u` to two significant digits (negative: round to tens, hundreds…). */
export function decimalsForU(u: number): number {
  if (!(u > 0) || !Number.isFinite(u)) return 0;
  return 1 - Math.floor(Math.log10(u));
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
