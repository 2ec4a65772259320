// Small sample statistics for the benchmarks: mean, spread, quantiles, and the least-squares slope bound.

export function mean(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x;
  return s / xs.length;
}

/** Sample standard deviation (n − 1). */
export function stdev(xs: readonly number[]): number {
  const m = mean(xs);
  let s = 0;
  for (const x of xs) s += (x - m) ** 2;
  return Math.sqrt(s / (xs.length - 1));
}

/** Root mean square about zero (for errors against truth). */
export function rms(xs: readonly number[]): number {
  let s = 0;
  for (const x of xs) s += x * x;
  return Math.sqrt(s / xs.length);
}

/** Quantile by linear interpolation between order statistics (q in [0, 1]). */
export function quantile(xs: readonly number[], q: number): number {
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.min(lo + 1, s.length - 1);
  return s[lo]! + (s[hi]! - s[lo]!) * (pos - lo);
}

export function min(xs: readonly number[]): number {
  return xs.reduce((a, b) => Math.min(a, b), Infinity);
}

export function max(xs: readonly number[]): number {
  return xs.reduce((a, b) => Math.max(a, b), -Infinity);
}

/**
 * Standard deviation of the least-squares slope of N equally spaced points with iid jitter σ:
 * σ·sqrt(12 / (N(N² − 1))). Bevington & Robinson, "Data Reduction and Error Analysis", ch. 6 (from memory);
 * the same value is the Cramér–Rao bound for Gaussian jitter, Kay, "Fundamentals of Statistical Signal
 * Processing" vol. I, Example 3.4 (from memory).
 */
export function lsSlopeSigma(sigma: number, n: number): number {
  return sigma * Math.sqrt(12 / (n * (n * n - 1)));
}

/** Least-squares straight line y = a + b·x. */
export function fitLine(xs: readonly number[], ys: readonly number[]): { a: number; b: number } {
  const mx = mean(xs);
  const my = mean(ys);
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < xs.length; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  const b = sxy / sxx;
  return { a: my - b * mx, b };
}

/**
 * Least-squares fit of pass times t_k = a + b·k + c·(−1)^k (a gate off the lowest point makes consecutive
 * half-periods alternate long and short); returns the half-period b.
 */
export function fitHalfPeriod(k: readonly number[], t: readonly number[]): number {
  // Normal equations of the three-parameter model (centred, so the intercept drops out of b and c).
  const mk = mean(k);
  const mt = mean(t);
  let n = 0;
  let sa = 0; // Σ alt
  let skk = 0;
  let ska = 0;
  let saa = 0;
  let sky = 0;
  let say = 0;
  let sy = 0;
  for (let i = 0; i < k.length; i++) {
    const x = k[i]! - mk;
    const alt = k[i]! % 2 === 0 ? 1 : -1;
    const y = t[i]! - mt;
    n++;
    sa += alt;
    skk += x * x;
    ska += x * alt;
    saa += alt * alt;
    sky += x * y;
    say += alt * y;
    sy += y;
  }
  // Unknowns (a, b, c) with columns 1, x, alt; Σx = 0 by centring.
  const m = [
    [n, 0, sa],
    [0, skk, ska],
    [sa, ska, saa],
  ] as const;
  const r = [sy, sky, say] as const;
  const det3 = (c0: readonly number[], c1: readonly number[], c2: readonly number[]): number =>
    c0[0]! * (c1[1]! * c2[2]! - c2[1]! * c1[2]!) - c1[0]! * (c0[1]! * c2[2]! - c2[1]! * c0[2]!) + c2[0]! * (c0[1]! * c1[2]! - c1[1]! * c0[2]!);
  const col = (j: number): number[] => [m[0][j]!, m[1][j]!, m[2][j]!];
  return det3(col(0), [...r], col(2)) / det3(col(0), col(1), col(2));
}
