// Small sample statistics used across the analysis: median, mean, standard deviation, batch means.

/** The finite values of an array, sorted ascending, as a Float64Array (native numeric sort). */
function sortedFinite(xs: ArrayLike<number>): Float64Array {
  let n = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) n++;
  const v = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) v[k++] = xs[i]!;
  return v.sort();
}

/** Median of the finite values of an array (NaN when there are none); does not modify the input. */
export function median(xs: ArrayLike<number>): number {
  const v = sortedFinite(xs);
  if (v.length === 0) return NaN;
  const h = v.length >> 1;
  return v.length % 2 ? v[h]! : 0.5 * (v[h - 1]! + v[h]!);
}

/** Mean and sample standard deviation of the finite values (two-pass, for accuracy). */
export function meanStd(xs: ArrayLike<number>): { mean: number; std: number; n: number } {
  let n = 0;
  let s = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) (s += xs[i]!), n++;
  if (n === 0) return { mean: NaN, std: NaN, n };
  const mean = s / n;
  let q = 0;
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) q += (xs[i]! - mean) ** 2;
  return { mean, std: n > 1 ? Math.sqrt(q / (n - 1)) : NaN, n };
}

/**
 * Standard error of the mean of a serially correlated sequence by non-overlapping batch means
 * (common practice in simulation output analysis, no source here): consecutive full periods share an end point,
 * so their errors are anti-correlated and σ/√n would be wrong; means over long batches are nearly independent.
 * Falls back to σ/√n when there are fewer than 2·minBatches values.
 */
export function batchMeansStdError(xs: ArrayLike<number>, minBatches = 10, maxBatches = 30): number {
  const v: number[] = [];
  for (let i = 0; i < xs.length; i++) if (Number.isFinite(xs[i]!)) v.push(xs[i]!);
  const n = v.length;
  if (n < 2) return NaN;
  if (n < 2 * minBatches) return meanStd(v).std / Math.sqrt(n);
  const nb = Math.min(maxBatches, Math.floor(n / 2));
  const means: number[] = [];
  for (let b = 0; b < nb; b++) {
    const lo = Math.floor((b * n) / nb);
    const hi = Math.floor(((b + 1) * n) / nb);
    let s = 0;
    for (let i = lo; i < hi; i++) s += v[i]!;
    means.push(s / (hi - lo));
  }
  return meanStd(means).std / Math.sqrt(nb);
}

/** Median absolute deviation scaled to σ for a normal distribution (×1.4826). */
export function robustSigma(xs: ArrayLike<number>): number {
  const m = median(xs);
  const d = sortedFinite(xs);
  for (let i = 0; i < d.length; i++) d[i] = Math.abs(d[i]! - m);
  return 1.4826 * median(d);
}

/** About `max` evenly spread values of an array (all when shorter): enough for a robust median, much cheaper. */
export function everyKth(xs: ArrayLike<number>, max: number): Float64Array {
  const stride = Math.max(1, Math.floor(xs.length / max));
  const out = new Float64Array(Math.ceil(xs.length / stride));
  for (let i = 0, k = 0; i < xs.length; i += stride) out[k++] = xs[i]!;
  return out;
}

/** Lag-1 autocorrelation of a series (0 when it cannot be estimated); callers clamp it to the range they model. */
export function lag1(r: readonly number[]): number {
  let num = 0;
  let den = 0;
  for (let i = 0; i < r.length; i++) {
    den += r[i]! * r[i]!;
    if (i > 0) num += r[i]! * r[i - 1]!;
  }
  return den > 0 ? num / den : 0;
}
