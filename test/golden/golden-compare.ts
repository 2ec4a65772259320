// Comparison of an analysis output with its golden file, tolerant only of floating-point reordering.
//
// Tolerance: a number matches when |actual − golden| ≤ 1e-10·|golden| + 1e-15. Reordering a sum or a product moves
// the last bits (~1e-16 relative per operation); the fixed-point loops of the analysis can carry that to ~1e-12
// when an iteration stops one round earlier or later. 1e-10 is far below every printed figure (g is quoted to
// ~1e-7 relative) yet catches any real change of a figure. The absolute 1e-15 covers values that are zero in the
// golden (the smallest real figures, clock residuals and B_u, are ≥ ~1e-8 in their units).
// Structure: strings, booleans, nulls and array lengths must match exactly; every key of the golden must be present.
// Keys the golden lacks are allowed, so that a new result field needs no new goldens (moved figures do).
// Size: an array of more than 200 numbers (the plot series, up to 2000 points each) is kept as its length and every
// k-th value (≤ 200 of them), which keeps the five files near 100 KB instead of 700 KB.

const REL = 1e-10;
const ABS = 1e-15;
const KEEP = 200;

/** A long numeric array in a golden file: its length and every `stride`-th value. */
interface Thinned {
  readonly $thinned: { readonly length: number; readonly stride: number; readonly values: readonly (number | null)[] };
}

const isLongNumeric = (v: unknown): v is (number | null)[] => Array.isArray(v) && v.length > KEEP && v.every((x) => x === null || typeof x === 'number');
const isThinned = (v: unknown): v is Thinned => v !== null && typeof v === 'object' && '$thinned' in v;

function thinned(v: (number | null)[]): Thinned {
  const stride = Math.ceil(v.length / KEEP);
  return { $thinned: { length: v.length, stride, values: v.filter((_, i) => i % stride === 0) } };
}

/** The value as stored in a golden file (long numeric arrays thinned). */
function compact(v: unknown): unknown {
  if (isLongNumeric(v)) return thinned(v);
  if (Array.isArray(v)) return v.map(compact);
  if (v !== null && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, compact(x)]));
  return v;
}

/** Paths and values where `actual` does not reproduce `golden` (empty when it does). */
export function goldenDifferences(actual: unknown, golden: unknown, path = '$'): string[] {
  if (isThinned(golden)) {
    const g = golden.$thinned;
    if (!Array.isArray(actual) || actual.length !== g.length) return [`${path}: golden has ${g.length} items, got ${Array.isArray(actual) ? actual.length : JSON.stringify(actual)}`];
    return goldenDifferences(actual.filter((_, i) => i % g.stride === 0), g.values, path);
  }
  if (typeof golden === 'number') {
    if (typeof actual !== 'number') return [`${path}: golden ${golden}, got ${JSON.stringify(actual)}`];
    return Math.abs(actual - golden) <= REL * Math.abs(golden) + ABS ? [] : [`${path}: golden ${golden}, got ${actual}`];
  }
  if (Array.isArray(golden)) {
    if (!Array.isArray(actual)) return [`${path}: golden is an array, got ${JSON.stringify(actual)}`];
    if (actual.length !== golden.length) return [`${path}: golden has ${golden.length} items, got ${actual.length}`];
    return golden.flatMap((g, i) => goldenDifferences(actual[i], g, `${path}[${i}]`));
  }
  if (golden !== null && typeof golden === 'object') {
    if (actual === null || typeof actual !== 'object' || Array.isArray(actual)) return [`${path}: golden is an object, got ${JSON.stringify(actual)}`];
    const a = actual as Record<string, unknown>;
    return Object.entries(golden).flatMap(([k, g]) => (k in a ? goldenDifferences(a[k], g, `${path}.${k}`) : [`${path}.${k}: missing`]));
  }
  return actual === golden ? [] : [`${path}: golden ${JSON.stringify(golden)}, got ${JSON.stringify(actual)}`];
}

/** The golden file text: one top-level key per line, so that a diff shows which figure moved. */
export function goldenText(value: unknown): string {
  const o = value as Record<string, unknown>;
  return `{\n${Object.entries(compact(o) as Record<string, unknown>)
    .map(([k, v]) => `${JSON.stringify(k)}: ${JSON.stringify(v)}`)
    .join(',\n')}\n}\n`;
}
