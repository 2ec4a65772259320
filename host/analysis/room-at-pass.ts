// The room at each pass, for the per-swing table: readings interpolated in time, nothing made up across a gap in them.
import type { RoomReading } from './room-drift.ts';

/** Temperature (°C), pressure (Pa) and humidity (%RH) per time; NaN where the readings do not cover it. */
export interface RoomColumns {
  readonly tempC: Float64Array;
  readonly pressPa: Float64Array;
  readonly rhPct: Float64Array;
}

/** Interpolation spans up to this many reading intervals: one or two lost readings, not a sensor outage. */
export const MAX_SPAN_INTERVALS = 3;

/** Median of the positive spacings of sorted times (the reading interval), null with fewer than two readings. */
function medianSpacing(sorted: readonly RoomReading[]): number | null {
  const d: number[] = [];
  for (let i = 1; i < sorted.length; i++) if (sorted[i]!.t_s > sorted[i - 1]!.t_s) d.push(sorted[i]!.t_s - sorted[i - 1]!.t_s);
  d.sort((a, b) => a - b);
  return d.length ? d[(d.length - 1) >> 1]! : null;
}

/**
 * The room at each of `times`: linear between the two readings around it when they are at most
 * MAX_SPAN_INTERVALS reading intervals apart; the nearest reading within one interval before the first or
 * after the last; otherwise NaN (the CSV leaves the cell empty).
 */
export function roomAtTimes(readings: readonly RoomReading[], times: ArrayLike<number>): RoomColumns {
  const n = times.length;
  const out = { tempC: new Float64Array(n).fill(NaN), pressPa: new Float64Array(n).fill(NaN), rhPct: new Float64Array(n).fill(NaN) };
  const r = [...readings].sort((a, b) => a.t_s - b.t_s);
  const step = medianSpacing(r);
  if (step === null) return out;
  const set = (i: number, a: RoomReading, b: RoomReading, f: number): void => {
    out.tempC[i] = a.tempC + f * (b.tempC - a.tempC);
    out.pressPa[i] = a.pressPa + f * (b.pressPa - a.pressPa);
    out.rhPct[i] = a.rhPct + f * (b.rhPct - a.rhPct);
  };
  const first = r[0]!;
  const last = r[r.length - 1]!;
  for (let i = 0; i < n; i++) {
    const t = times[i]!;
    if (!Number.isFinite(t)) continue;
    if (t <= first.t_s) {
      if (first.t_s - t <= step) set(i, first, first, 0);
      continue;
    }
    if (t >= last.t_s) {
      if (t - last.t_s <= step) set(i, last, last, 0);
      continue;
    }
    let lo = 0;
    let hi = r.length - 1;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (r[mid]!.t_s <= t) lo = mid;
      else hi = mid;
    }
    const a = r[lo]!;
    const b = r[hi]!;
    if (b.t_s - a.t_s <= MAX_SPAN_INTERVALS * step) set(i, a, b, b.t_s > a.t_s ? (t - a.t_s) / (b.t_s - a.t_s) : 0);
  }
  return out;
}
