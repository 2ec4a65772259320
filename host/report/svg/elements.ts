// SVG element strings: paths, markers, bands and text, from pixel coordinates. Pure string building.
import { esc } from '../escape.ts';

export type Point = readonly [number, number];

/** Marker shapes that stay distinguishable in greyscale print. */
export type MarkerShape = 'circle' | 'square' | 'triangle' | 'diamond' | 'cross';

/** How a series is stroked and filled; classes refer to the report's stylesheet. */
export interface Stroke {
  readonly cls: string;
  /** Dash pattern, so lines differ without colour. */
  readonly dash?: string;
}

/** Coordinates with two decimals: enough for print, keeps the page small. */
export function px(v: number): string {
  return (Math.round(v * 100) / 100).toString();
}

function dashAttr(dash?: string): string {
  return dash ? ` stroke-dasharray="${esc(dash)}"` : '';
}

/** A polyline through the points; a break (null) starts a new sub-path so gaps in the data stay gaps. */
export function linePath(points: readonly (Point | null)[], stroke: Stroke): string {
  let d = '';
  let pen = false;
  for (const p of points) {
    if (p === null) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${px(p[0])} ${px(p[1])}`;
    pen = true;
  }
  return d ? `<path class="${esc(stroke.cls)}" d="${d}" fill="none"${dashAttr(stroke.dash)}/>` : '';
}

/** One marker path string for a shape of half-size r centred at (x, y). */
function markerD(shape: MarkerShape, x: number, y: number, r: number): string {
  switch (shape) {
    case 'circle':
      return `M${px(x - r)} ${px(y)}a${px(r)} ${px(r)} 0 1 0 ${px(2 * r)} 0a${px(r)} ${px(r)} 0 1 0 ${px(-2 * r)} 0Z`;
    case 'square':
      return `M${px(x - r)} ${px(y - r)}h${px(2 * r)}v${px(2 * r)}h${px(-2 * r)}Z`;
    case 'triangle':
      return `M${px(x)} ${px(y - r * 1.15)}L${px(x + r)} ${px(y + r * 0.85)}L${px(x - r)} ${px(y + r * 0.85)}Z`;
    case 'diamond':
      return `M${px(x)} ${px(y - r * 1.3)}L${px(x + r)} ${px(y)}L${px(x)} ${px(y + r * 1.3)}L${px(x - r)} ${px(y)}Z`;
    case 'cross':
      return `M${px(x - r)} ${px(y - r)}L${px(x + r)} ${px(y + r)}M${px(x - r)} ${px(y + r)}L${px(x + r)} ${px(y - r)}`;
  }
}

/** All markers of a series as one path element (one element per series keeps large runs light). */
export function markers(points: readonly Point[], shape: MarkerShape, r: number, cls: string): string {
  if (points.length === 0) return '';
  const d = points.map(([x, y]) => markerD(shape, x, y, r)).join('');
  return `<path class="${esc(cls)}" d="${d}"/>`;
}

/** A filled band between an upper and a lower edge sampled at the same x positions. */
export function band(upper: readonly Point[], lower: readonly Point[], cls: string): string {
  if (upper.length < 2 || upper.length !== lower.length) return '';
  const pts = [...upper, ...[...lower].reverse()];
  const d = pts.map((p, i) => `${i ? 'L' : 'M'}${px(p[0])} ${px(p[1])}`).join('');
  return `<path class="${esc(cls)}" d="${d}Z"/>`;
}

/** A straight segment. */
export function segment(a: Point, b: Point, cls: string, dash?: string): string {
  return `<line class="${esc(cls)}" x1="${px(a[0])}" y1="${px(a[1])}" x2="${px(b[0])}" y2="${px(b[1])}"${dashAttr(dash)}/>`;
}

/** A text label; `anchor` is the SVG text-anchor, `rotate` turns it about its own anchor point. */
export function label(x: number, y: number, text: string, opts: { cls?: string; anchor?: 'start' | 'middle' | 'end'; rotate?: number; dy?: string } = {}): string {
  const rot = opts.rotate ? ` transform="rotate(${opts.rotate} ${px(x)} ${px(y)})"` : '';
  const dy = opts.dy ? ` dy="${esc(opts.dy)}"` : '';
  return `<text class="${esc(opts.cls ?? 'lbl')}" x="${px(x)}" y="${px(y)}" text-anchor="${opts.anchor ?? 'start'}"${dy}${rot}>${esc(text)}</text>`;
}
