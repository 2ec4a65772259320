// The figure wrapper every plot shares, the "no data" placeholder, and axis units chosen from the data's size.
import { esc } from '../escape.ts';

/** A numbered figure with a caption; `body` (SVG or a placeholder) and `controls` (markup before it) are already escaped. */
export function figure(id: string, n: number, title: string, caption: string, body: string, controls = ''): string {
  return `<figure class="fig" id="${esc(id)}">${controls}<div class="fig-body">${body}</div><figcaption><span class="fig-n">Figure ${n}</span> <strong>${esc(title)}.</strong> ${esc(caption)}</figcaption></figure>`;
}

/** What stands in for a plot when its data is missing: says what is needed instead of drawing empty axes. */
export function noData(why: string): string {
  return `<p class="nodata"><span class="nodata-k">No plot</span> ${esc(why)}</p>`;
}

/** A time axis unit that keeps tick labels short for the run's length. */
export function timeUnit(maxS: number): { div: number; name: string } {
  if (maxS > 3 * 3600) return { div: 3600, name: 'h' };
  if (maxS > 600) return { div: 60, name: 'min' };
  return { div: 1, name: 's' };
}

/** A unit for small time differences (residuals, offsets) from their largest magnitude. */
export function smallTimeUnit(maxAbsS: number): { mul: number; name: string } {
  if (maxAbsS >= 0.5) return { mul: 1, name: 's' };
  if (maxAbsS >= 5e-4) return { mul: 1e3, name: 'ms' };
  return { mul: 1e6, name: 'µs' };
}

/** Largest finite magnitude of a list (0 when none). */
export function maxAbs(xs: readonly number[]): number {
  let m = 0;
  for (const x of xs) if (Number.isFinite(x) && Math.abs(x) > m) m = Math.abs(x);
  return m;
}

/**
 * A y range that shows the bulk of the data: the 2nd to 98th percentile widened by a quarter each way, plus
 * the `keep` values (curves that must stay visible). A few wild points (a bridged gap, a knock) then do not
 * flatten the rest; `outside` counts the points left beyond the axis so the caption can say so.
 */
export function robustDomain(values: readonly number[], keep: readonly number[] = []): { domain: [number, number]; outside: number } | null {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (v.length < 20) return null;
  const lo0 = v[Math.floor(0.02 * (v.length - 1))]!;
  const hi0 = v[Math.ceil(0.98 * (v.length - 1))]!;
  const pad = 0.25 * (hi0 - lo0);
  const k = keep.filter(Number.isFinite);
  const lo = Math.min(lo0 - pad, ...k);
  const hi = Math.max(hi0 + pad, ...k);
  if (!(hi > lo)) return null;
  return { domain: [lo, hi], outside: v.filter((x) => x < lo || x > hi).length };
}

/** `n` evenly spaced values from a to b inclusive. */
export function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}
