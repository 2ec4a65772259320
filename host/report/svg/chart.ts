// A small chart: one or more stacked panels sharing an x axis, with ticks, grid, axis titles and a legend.
import { esc } from '../escape.ts';
import { band, label, linePath, markers, px, segment, type MarkerShape, type Point } from './elements.ts';
import { linearScale, logScale, type Scale, type ScaleKind } from './scale.ts';

/** A drawable series; `tone` picks one of four stylesheet tones, dash and shape keep series apart in greyscale. */
export type SeriesSpec =
  | { readonly kind: 'points'; readonly label: string; readonly x: readonly number[]; readonly y: readonly number[]; readonly shape: MarkerShape; readonly tone: Tone }
  | { readonly kind: 'line'; readonly label: string; readonly x: readonly number[]; readonly y: readonly number[]; readonly dash?: string; readonly tone: Tone }
  | { readonly kind: 'band'; readonly label: string; readonly x: readonly number[]; readonly lo: readonly number[]; readonly hi: readonly number[]; readonly tone: Tone }
  | { readonly kind: 'hline'; readonly label: string; readonly y: number; readonly dash?: string; readonly tone: Tone };

export type Tone = 1 | 2 | 3 | 4;

/** One panel: its own y axis. */
export interface PanelSpec {
  readonly yLabel: string;
  readonly yScale?: ScaleKind;
  readonly series: readonly SeriesSpec[];
  /** Relative height among the panels (default 1). */
  readonly weight?: number;
  /** Force the y range to include this value (e.g. 0 for residuals). */
  readonly include?: number;
  /** A fixed y domain (still widened to nice numbers), for data whose early values would swamp the rest. */
  readonly domain?: readonly [number, number];
  /** A short note in the panel's top right corner (e.g. how many points lie beyond the axis). */
  readonly note?: string;
}

export interface ChartSpec {
  /** Unique within the page: prefixes the clip-path ids. */
  readonly id: string;
  readonly title: string;
  readonly xLabel: string;
  readonly xScale?: ScaleKind;
  readonly panels: readonly PanelSpec[];
  readonly width?: number;
  /** Total height of the plotting areas, shared out by weight. */
  readonly plotHeight?: number;
}

const M = { left: 80, right: 18, axisBottom: 44, gap: 16, legendRow: 18, top: 8 };
const CHAR_W = 6.6;

function finitePairs(xs: readonly number[], ys: readonly number[], sx: Scale, sy: Scale): Point[] {
  const out: Point[] = [];
  const n = Math.min(xs.length, ys.length);
  for (let i = 0; i < n; i++) {
    const x = xs[i]!;
    const y = ys[i]!;
    if (sx.accepts(x) && sy.accepts(y)) out.push([sx.map(x), sy.map(y)]);
  }
  return out;
}

function extent(values: Iterable<number>, kind: ScaleKind): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v) || (kind === 'log' && v <= 0)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}

function* xValues(s: SeriesSpec): Iterable<number> {
  if (s.kind !== 'hline') yield* s.x;
}

function* yValues(s: SeriesSpec): Iterable<number> {
  if (s.kind === 'band') {
    yield* s.lo;
    yield* s.hi;
  } else if (s.kind === 'hline') yield s.y;
  else yield* s.y;
}

function makeScale(kind: ScaleKind, ext: [number, number] | null, range: [number, number]): Scale {
  if (kind === 'log') return logScale(ext ?? [1, 10], range);
  return linearScale(ext ?? [0, 1], range);
}

/** Lays legend entries out in rows that fit the width; returns the SVG and its height. */
function legend(series: readonly SeriesSpec[], width: number): { svg: string; height: number } {
  const entries = series.filter((s) => s.label !== '');
  if (entries.length === 0) return { svg: '', height: 0 };
  let x = M.left;
  let row = 0;
  const parts: string[] = [];
  for (const s of entries) {
    const w = 30 + s.label.length * CHAR_W + 18;
    if (x + w > width - M.right && x > M.left) {
      row++;
      x = M.left;
    }
    const y = M.top + row * M.legendRow + 9;
    const cls = `t${s.tone}`;
    if (s.kind === 'points') parts.push(markers([[x + 12, y]], s.shape, 3.4, `mk ${cls}`));
    else if (s.kind === 'band') parts.push(`<rect class="bd ${cls}" x="${px(x)}" y="${px(y - 5)}" width="24" height="10"/>`);
    else parts.push(segment([x, y], [x + 24, y], `ln ${cls}`, s.dash));
    parts.push(label(x + 30, y, s.label, { cls: 'lg', dy: '0.32em' }));
    x += w;
  }
  return { svg: `<g class="legend">${parts.join('')}</g>`, height: (row + 1) * M.legendRow + 6 };
}

function drawSeries(s: SeriesSpec, sx: Scale, sy: Scale): string {
  const cls = `t${s.tone}`;
  switch (s.kind) {
    case 'points': {
      // Long runs have thousands of swings: smaller markers keep the cloud readable instead of a blot.
      const pts = finitePairs(s.x, s.y, sx, sy);
      return markers(pts, s.shape, pts.length > 1500 ? 1.3 : pts.length > 300 ? 1.9 : 2.6, `mk ${cls}`);
    }
    case 'line': {
      const pts: (Point | null)[] = [];
      for (let i = 0; i < Math.min(s.x.length, s.y.length); i++) {
        const x = s.x[i]!;
        const y = s.y[i]!;
        pts.push(sx.accepts(x) && sy.accepts(y) ? [sx.map(x), sy.map(y)] : null);
      }
      return linePath(pts, { cls: `ln ${cls}`, ...(s.dash ? { dash: s.dash } : {}) });
    }
    case 'band': {
      const up: Point[] = [];
      const lo: Point[] = [];
      for (let i = 0; i < s.x.length; i++) {
        const x = s.x[i]!;
        const a = s.lo[i]!;
        const b = s.hi[i]!;
        if (sx.accepts(x) && sy.accepts(a) && sy.accepts(b)) {
          up.push([sx.map(x), sy.map(b)]);
          lo.push([sx.map(x), sy.map(a)]);
        }
      }
      return band(up, lo, `bd ${cls}`);
    }
    case 'hline': {
      if (!sy.accepts(s.y)) return '';
      const y = sy.map(s.y);
      return segment([sx.range[0], y], [sx.range[1], y], `ln ${cls}`, s.dash);
    }
  }
}

/** Renders the chart as a standalone `<svg>` element string with a title for screen readers. */
export function renderChart(spec: ChartSpec): string {
  const width = spec.width ?? 720;
  const plotHeight = spec.plotHeight ?? 300;
  const all = spec.panels.flatMap((p) => p.series);
  const lg = legend(all, width);
  const xKind = spec.xScale ?? 'linear';
  const sx = makeScale(xKind, extent(all.flatMap((s) => [...xValues(s)]), xKind), [M.left, width - M.right]);
  const weights = spec.panels.map((p) => p.weight ?? 1);
  const wsum = weights.reduce((a, b) => a + b, 0);
  const usable = plotHeight - M.gap * (spec.panels.length - 1);
  const height = M.top + lg.height + plotHeight + M.axisBottom;
  const out: string[] = [];
  let top = M.top + lg.height;
  spec.panels.forEach((p, i) => {
    const h = (usable * weights[i]!) / wsum;
    const yKind = p.yScale ?? 'linear';
    const ys = [...p.series.flatMap((s) => [...yValues(s)]), ...(p.include !== undefined ? [p.include] : [])];
    const sy = makeScale(yKind, p.domain ? [p.domain[0], p.domain[1]] : extent(ys, yKind), [top + h, top]);
    const clip = `${spec.id}-clip${i}`;
    const last = i === spec.panels.length - 1;
    const g: string[] = [];
    const pw = width - M.left - M.right;
    // Lines and bands stop at the frame; markers may overhang it by their radius, so a point on the edge of
    // the domain is drawn whole rather than cut in half.
    g.push(`<clipPath id="${esc(clip)}"><rect x="${px(M.left)}" y="${px(top)}" width="${px(pw)}" height="${px(h)}"/></clipPath>`);
    g.push(`<clipPath id="${esc(clip)}m"><rect x="${px(M.left - 4)}" y="${px(top - 4)}" width="${px(pw + 8)}" height="${px(h + 8)}"/></clipPath>`);
    g.push(`<rect class="plot-bg" x="${px(M.left)}" y="${px(top)}" width="${px(width - M.left - M.right)}" height="${px(h)}"/>`);
    for (const t of sy.ticks()) {
      const y = sy.map(t.value);
      g.push(segment([M.left, y], [width - M.right, y], 'grid'));
      g.push(label(M.left - 6, y, t.label, { cls: 'tick', anchor: 'end', dy: '0.32em' }));
    }
    for (const t of sx.ticks()) {
      const x = sx.map(t.value);
      g.push(segment([x, top], [x, top + h], 'grid'));
      // Keep the outermost labels inside the drawing (estimated text width, as for the legend).
      const half = (t.label.length * CHAR_W) / 2;
      if (last) g.push(label(Math.min(Math.max(x, half + 2), width - half - 2), top + h + 15, t.label, { cls: 'tick', anchor: 'middle' }));
    }
    // Series keep their order (later ones on top), each under the clip that suits its kind.
    for (const s of p.series) g.push(`<g clip-path="url(#${esc(clip)}${s.kind === 'points' ? 'm' : ''})">${drawSeries(s, sx, sy)}</g>`);
    g.push(`<rect class="frame" x="${px(M.left)}" y="${px(top)}" width="${px(width - M.left - M.right)}" height="${px(h)}"/>`);
    g.push(label(14, top + h / 2, p.yLabel, { cls: 'axt', anchor: 'middle', rotate: -90 }));
    if (p.note) g.push(label(width - M.right - 6, top + 13, p.note, { cls: 'pnote', anchor: 'end' }));
    if (last) g.push(label((M.left + width - M.right) / 2, top + h + 36, spec.xLabel, { cls: 'axt', anchor: 'middle' }));
    out.push(`<g class="panel">${g.join('')}</g>`);
    top += h + M.gap;
  });
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" class="chart" viewBox="0 0 ${width} ${px(height)}" width="${width}" height="${px(height)}" role="img" aria-label="${esc(spec.title)}">` +
    `<title>${esc(spec.title)}</title>${lg.svg}${out.join('')}</svg>`
  );
}
