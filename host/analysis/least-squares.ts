// Weighted linear least squares with parameter covariance, for the small fits of the analysis (≤ 4 parameters).

/** Result of a linear fit y ≈ Σ p_j·f_j(x). */
export interface LinearFit {
  readonly params: number[];
  /** Covariance of the parameters, scaled by the residual variance (weights taken as relative). */
  readonly cov: number[][];
  /** Weighted sum of squared residuals. */
  readonly chi2: number;
  readonly n: number;
  readonly dof: number;
}

/** Inverts a small symmetric positive-definite matrix by Gauss–Jordan elimination with pivoting; null if singular. */
export function invertSmall(a: readonly (readonly number[])[]): number[][] | null {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r]![c]!) > Math.abs(m[p]![c]!)) p = r;
    const piv = m[p]![c]!;
    if (!(Math.abs(piv) > 1e-300)) return null;
    [m[c], m[p]] = [m[p]!, m[c]!];
    const row = m[c]!;
    for (let j = 0; j < 2 * n; j++) row[j]! /= piv;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r]![c]!;
      if (f !== 0) for (let j = 0; j < 2 * n; j++) m[r]![j]! -= f * row[j]!;
    }
  }
  return m.map((row) => row.slice(n));
}

/**
 * Fits y ≈ Σ p_j·basis_j(i) over i in [0, n) with weights w (default 1). Columns are scaled before solving so that
 * ill-scaled bases (1, θ², θ⁴) stay well conditioned. Returns null when the system is singular or n ≤ parameters.
 */
export function linearFit(
  n: number,
  y: (i: number) => number,
  basis: readonly ((i: number) => number)[],
  weight: (i: number) => number = () => 1,
): LinearFit | null {
  const p = basis.length;
  const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const aty = new Array<number>(p).fill(0);
  const scale = new Array<number>(p).fill(0);
  let count = 0;
  const row = new Array<number>(p);
  for (let i = 0; i < n; i++) {
    const w = weight(i);
    const yi = y(i);
    if (!(w > 0) || !Number.isFinite(yi)) continue;
    for (let j = 0; j < p; j++) scale[j] = Math.max(scale[j]!, Math.abs(basis[j]!(i)));
  }
  for (let j = 0; j < p; j++) if (!(scale[j]! > 0)) return null;
  for (let i = 0; i < n; i++) {
    const w = weight(i);
    const yi = y(i);
    if (!(w > 0) || !Number.isFinite(yi)) continue;
    count++;
    for (let j = 0; j < p; j++) row[j] = basis[j]!(i) / scale[j]!;
    for (let j = 0; j < p; j++) {
      aty[j]! += w * row[j]! * yi;
      for (let k = 0; k <= j; k++) ata[j]![k]! += w * row[j]! * row[k]!;
    }
  }
  if (count <= p) return null;
  for (let j = 0; j < p; j++) for (let k = j + 1; k < p; k++) ata[j]![k] = ata[k]![j]!;
  const inv = invertSmall(ata);
  if (!inv) return null;
  const ps = inv.map((r) => r.reduce((s, v, k) => s + v * aty[k]!, 0));
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const w = weight(i);
    const yi = y(i);
    if (!(w > 0) || !Number.isFinite(yi)) continue;
    let f = 0;
    for (let j = 0; j < p; j++) f += (ps[j]! * basis[j]!(i)) / scale[j]!;
    chi2 += w * (yi - f) ** 2;
  }
  const dof = count - p;
  const s2 = chi2 / dof;
  return {
    params: ps.map((v, j) => v / scale[j]!),
    cov: inv.map((r, j) => r.map((v, k) => (v * s2) / (scale[j]! * scale[k]!))),
    chi2,
    n: count,
    dof,
  };
}
