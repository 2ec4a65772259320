// A reversible pendulum built from a bar: uniform bar, point masses (fixed and one movable), two knife edges.
// Positions are measured along the bar from its top end (pivot 1 up); pivot 2 is the bar turned over.

export interface BarSpec {
  readonly length_m: number;
  readonly mass_kg: number;
  /** Knife edges from the top end: edge 1 above the centre of mass, edge 2 below it. */
  readonly edges_m: readonly [number, number];
  readonly fixed: readonly { readonly mass_kg: number; readonly position_m: number }[];
  readonly movable_kg: number;
}

/** What one pivot of the bar gives the simulator: true h, k about the centre of mass, and the knife-edge distance. */
export interface BarPivot {
  readonly h_m: number;
  readonly k_m: number;
  readonly l_m: number;
}

/** The bar with its movable mass at `x` (from the top end), swung on edge `pivot`. Null when the centre of mass is not between the edges. */
export function barPivot(bar: BarSpec, x: number, pivot: 1 | 2): BarPivot | null {
  const parts = [{ m: bar.mass_kg, y: bar.length_m / 2 }, ...bar.fixed.map((f) => ({ m: f.mass_kg, y: f.position_m })), { m: bar.movable_kg, y: x }];
  const M = parts.reduce((s, p) => s + p.m, 0);
  const y = parts.reduce((s, p) => s + p.m * p.y, 0) / M;
  const I = (bar.mass_kg * bar.length_m ** 2) / 12 + parts.reduce((s, p) => s + p.m * (p.y - y) ** 2, 0);
  const [e1, e2] = bar.edges_m;
  if (!(e1 < y && y < e2)) return null;
  return { h_m: pivot === 1 ? y - e1 : e2 - y, k_m: Math.sqrt(I / M), l_m: e2 - e1 };
}

/** Zero-amplitude period T = 2π√((k² + h²)/(g h)) (docs/references.md#ref-reversible-pendulum). */
export function barPeriod(p: BarPivot, g: number): number {
  return 2 * Math.PI * Math.sqrt((p.k_m ** 2 + p.h_m ** 2) / (g * p.h_m));
}

/** The movable-mass position where T1 = T2 with h1 ≠ h2 (bisection between lo and hi), or null without a sign change. */
export function barCrossing(bar: BarSpec, g: number, lo: number, hi: number): number | null {
  const d = (x: number): number => {
    const a = barPivot(bar, x, 1);
    const b = barPivot(bar, x, 2);
    return a && b ? barPeriod(a, g) - barPeriod(b, g) : NaN;
  };
  let a = lo;
  let b = hi;
  const da = d(a);
  if (!(Math.sign(da) * Math.sign(d(b)) < 0)) return null;
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b);
    if (Math.sign(d(m)) === Math.sign(da)) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}
