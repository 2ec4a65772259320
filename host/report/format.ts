// Number formatting for the report: a value and its uncertainty rounded together, fixed units, durations.

const MINUS = '\u2212';

/** Typographic minus for negative numbers (the report's one convention; tests read it back). */
export function signed(s: string): string {
  return s.replace(/^-/, MINUS);
}

/** Decimal places that show `u` to `sig` significant figures (negative: round to tens, hundreds…). */
export function decimalsFor(u: number, sig = 2): number {
  if (!(u > 0) || !Number.isFinite(u)) return 0;
  return sig - 1 - Math.floor(Math.log10(u));
}

/** `v` rounded at `d` decimals where d may be negative (d = −1 rounds to tens). */
function place(v: number, d: number): string {
  return d >= 0 ? fixed(v, d) : fixed(Math.round(v / 10 ** -d) * 10 ** -d, 0);
}

/** `v` with `d` decimals, typographic minus, "−0" shown as "0". */
export function fixed(v: number, d: number): string {
  const s = v.toFixed(Math.min(d, 20));
  return signed(/^-0(\.0*)?$/.test(s) ? s.slice(1) : s);
}

// From a million up, digits stop being readable: such numbers (with such an uncertainty) get a shared power of
// ten ("1.24e18").
const BIG = 1e6;

/** Value ± uncertainty: the uncertainty to two significant figures (GUM 7.2.6), the value to the same place. */
export function valueU(v: number, u: number | null): { value: string; u: string | null } {
  if (u === null || !(u > 0) || !Number.isFinite(u)) return { value: sig(v, 6), u: null };
  if (u >= BIG) {
    const e = Math.floor(Math.log10(Math.max(Math.abs(v), u)));
    const k = 10 ** e;
    const d = Math.max(0, decimalsFor(u / k, 2));
    return { value: `${fixed(v / k, d)}e${e}`, u: `${fixed(u / k, d)}e${e}` };
  }
  const d = decimalsFor(u, 2);
  return { value: place(v, d), u: place(u, d) };
}

/** `v` to `n` significant figures: plain decimals, or m·10^e as "1.24e18" from a million up. */
export function sig(v: number, n: number): string {
  if (v === 0 || !Number.isFinite(v)) return Number.isFinite(v) ? '0' : '—';
  if (Math.abs(v) >= BIG) return signed(v.toExponential(n - 1).replace('e+', 'e'));
  const d = Math.max(0, n - 1 - Math.floor(Math.log10(Math.abs(v))));
  return fixed(v, d);
}

/** A duration as "1 h 02 min 03 s", "4 min 05 s" or "12.3 s". */
export function duration(s: number): string {
  if (!Number.isFinite(s) || s < 0) return '—';
  if (s < 60) return `${s.toFixed(1)} s`;
  const t = Math.round(s);
  const h = Math.floor(t / 3600);
  const m = Math.floor((t % 3600) / 60);
  const r = t % 60;
  const mm = String(m).padStart(2, '0');
  const rr = String(r).padStart(2, '0');
  return h > 0 ? `${h} h ${mm} min ${rr} s` : `${m} min ${rr} s`;
}
