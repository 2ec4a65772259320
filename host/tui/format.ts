// Number formatting for the live view: values with their uncertainty, durations, sizes, signed offsets.
import { plusMinus } from '../output/value-u.ts';

/** `value ± u` by the one rule of host/output/value-u.ts; without u the value to `fallbackDecimals`; `—` when unknown. */
export function formatWithU(value: number | null | undefined, u: number | null | undefined, fallbackDecimals = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  if (u === null || u === undefined || !(u > 0) || !Number.isFinite(u)) return value.toFixed(fallbackDecimals);
  return plusMinus(value, u);
}

/** A fixed-decimals number or `—`. */
export function formatFixed(value: number | null | undefined, decimals: number, signed = false): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const s = value.toFixed(decimals);
  if (Number(s) === 0) return s.replace(/^-/, '');
  return signed && value > 0 ? `+${s}` : s;
}

/** Elapsed seconds as h:mm:ss (or m:ss under an hour). */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.floor(Number.isFinite(seconds) ? seconds : 0));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const ss = String(s % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${ss}` : `${m}:${ss}`;
}

/** A byte count as B, kB, MB or GB (powers of 1000). */
export function formatBytes(bytes: number): string {
  if (!(bytes >= 0)) return '—';
  if (bytes < 1000) return `${bytes} B`;
  const units = ['kB', 'MB', 'GB', 'TB'];
  let v = bytes / 1000;
  let i = 0;
  while (v >= 1000 && i < units.length - 1) {
    v /= 1000;
    i++;
  }
  return `${v.toFixed(v < 10 ? 2 : v < 100 ? 1 : 0)} ${units[i]}`;
}

/** A speed factor as `×20` or `×0.5`, or `real time`. */
export function formatSpeed(speed: number): string {
  if (speed === 1) return 'real time';
  return `×${Number.isInteger(speed) ? speed : speed.toPrecision(2)}`;
}
