// Number formatting for the report: a value and its uncertainty rounded together, fixed units, durations.

import { roundAtK, significant, type Coverage } from '../output/value-u.ts';

const MINUS = '\u2212';

/** Typographic minus for negative numbers (the report's one convention; tests read it back). */
export function signed(s: string): string {
  return s.replace(/^-/, MINUS);
}

/** `v` with `d` decimals, typographic minus, "−0" shown as "0". */
export function fixed(v: number, d: number): string {
  const s = v.toFixed(Math.min(d, 20));
  return signed(/^-0(\.0*)?$/.test(s) ? s.slice(1) : s);
}

/** Value ± k·u by the one rule of host/output/value-u.ts (k = 1 unless asked), with the report's typographic minus. */
export function valueU(v: number, u: number | null, k: Coverage = 1): { value: string; u: string | null } {
  const r = roundAtK(v, u, k);
  return { value: signed(r.value), u: r.u === null ? null : signed(r.u) };
}

/** `v` to `n` significant figures (host/output/value-u.ts), typographic minus. */
export function sig(v: number, n: number): string {
  return signed(significant(v, n));
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
