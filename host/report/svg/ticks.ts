// Tick positions at "nice" numbers (1, 2, 5 × 10^k) for linear and logarithmic axes, and their labels.
import { signed } from '../format.ts';

/** The nice step (1, 2, 5 or 10 × 10^k) nearest to `span / count`, never zero for a finite positive span. */
export function niceStep(span: number, count: number): number {
  const raw = span / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  // Thresholds at the geometric means of neighbouring steps, so the chosen step is the nearest in ratio.
  const nice = f < Math.sqrt(2) ? 1 : f < Math.sqrt(10) ? 2 : f < Math.sqrt(50) ? 5 : 10;
  return nice * mag;
}

/** A domain widened outwards to whole multiples of the nice step; a degenerate domain is opened around its value. */
export function niceDomain(lo: number, hi: number, count = 5): [number, number] {
  let a = Math.min(lo, hi);
  let b = Math.max(lo, hi);
  // Spans below ~1e-9 of the values are float noise (a constant drawn twice): treat them as one value.
  if (!(b - a > 1e-9 * Math.max(Math.abs(a), Math.abs(b)))) {
    const pad = a === 0 ? 1 : Math.abs(a) * 0.01;
    a -= pad;
    b += pad;
  }
  const step = niceStep(b - a, count);
  return [Math.floor(a / step + 1e-9) * step, Math.ceil(b / step - 1e-9) * step];
}

/** Ticks at multiples of the nice step inside [lo, hi] (both inclusive, to rounding). */
export function linearTicks(lo: number, hi: number, count = 5): { ticks: number[]; step: number } {
  const step = niceStep(hi - lo, count);
  const first = Math.ceil(lo / step - 1e-9);
  const last = Math.floor(hi / step + 1e-9);
  // A span too small for the float grid (lo/step beyond 2^53) cannot be stepped: give the ends only.
  if (!Number.isSafeInteger(first) || !Number.isSafeInteger(last) || last - first > 10 * count + 10) return { ticks: [lo, hi], step: hi - lo };
  const ticks: number[] = [];
  for (let i = first; i <= last; i++) ticks.push(cleanFloat(i * step));
  return { ticks, step };
}

/** Ticks at 1, 2, 5 × 10^k inside [lo, hi] for a log axis (only decades when the range spans many). */
export function logTicks(lo: number, hi: number): number[] {
  const d0 = Math.floor(Math.log10(lo));
  const d1 = Math.ceil(Math.log10(hi));
  const decades = Math.log10(hi / lo);
  const mantissas = decades > 5 ? [1] : decades > 2.5 ? [1, 3] : [1, 2, 5];
  const out: number[] = [];
  for (let d = d0; d <= d1; d++) {
    for (const m of mantissas) {
      const v = cleanFloat(m * 10 ** d);
      if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) out.push(v);
    }
  }
  return out;
}

/** Label of a tick value with as many decimals as the step needs (no float noise such as 0.30000000000000004). */
export function tickLabel(v: number, step: number): string {
  // Labels of a million and more (a Q with no measurable loss) would not fit the margin: m·10^e as "2.5e17",
  // with as many mantissa digits as the step needs.
  if (Math.abs(v) >= 1e6 && Math.abs(v) >= step / 2) {
    const digits = Math.max(0, Math.floor(Math.log10(Math.abs(v))) - Math.floor(Math.log10(step) + 1e-9));
    return signed(Number(v.toExponential(digits)).toExponential().replace('e+', 'e'));
  }
  const decimals = Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
  const s = (Math.abs(v) < step / 2 ? 0 : v).toFixed(Math.min(decimals, 12));
  return signed(s);
}

/** Label of a log-axis tick: plain digits for 10^−3 … 10^5, otherwise m·10^k written with a superscript-free "e". */
export function logTickLabel(v: number): string {
  if (v >= 1e-3 && v < 1e5) return String(cleanFloat(v));
  return v.toExponential(0).replace('e+', 'e');
}

function cleanFloat(v: number): number {
  return Number(v.toPrecision(12));
}
