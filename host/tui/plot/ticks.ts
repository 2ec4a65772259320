// Axis ranges and tick marks for the terminal plots: "nice" steps of 1, 2 or 5 × 10^k.

/** A closed numeric interval. */
export interface Range {
  readonly min: number;
  readonly max: number;
}

/** The smallest 1, 2 or 5 × 10^k that is at least `rough`. */
export function niceStep(rough: number): number {
  if (!(rough > 0) || !Number.isFinite(rough)) return 1;
  const p = 10 ** Math.floor(Math.log10(rough));
  for (const m of [1, 2, 5, 10]) if (m * p >= rough * (1 - 1e-12)) return m * p;
  return 10 * p;
}

/** Range of finite values, widened around a single value or padded by `padFraction` of the span. */
export function dataRange(values: readonly number[], padFraction = 0.05, minSpan = 0): Range | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo > hi) return null;
  let span = hi - lo;
  if (span < minSpan) {
    const mid = (lo + hi) / 2;
    lo = mid - minSpan / 2;
    hi = mid + minSpan / 2;
    span = minSpan;
  }
  if (span === 0) {
    const w = Math.abs(lo) > 0 ? Math.abs(lo) * 1e-3 : 1;
    return { min: lo - w, max: hi + w };
  }
  return { min: lo - span * padFraction, max: hi + span * padFraction };
}

/** Tick values inside `range`, about `count` of them, on a nice step; also the decimals the step needs. */
export function niceTicks(range: Range, count: number): { values: number[]; decimals: number } {
  const span = range.max - range.min;
  if (!(span > 0) || count < 1) return { values: [], decimals: 0 };
  const step = niceStep(span / Math.max(1, count));
  const values: number[] = [];
  for (let v = Math.ceil(range.min / step - 1e-9) * step; v <= range.max + step * 1e-9; v += step) {
    values.push(Math.abs(v) < step * 1e-9 ? 0 : v);
    if (values.length > 1000) break;
  }
  return { values, decimals: Math.max(0, -Math.floor(Math.log10(step) + 1e-9)) };
}
