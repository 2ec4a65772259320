// A pure text chart: braille plot area, y ticks on the left, x ticks below, axis labels with units.
import { canvasRowRuns, createCanvas, drawLine, setDot } from './braille-canvas.ts';
import { dataRange, niceTicks, type Range } from './ticks.ts';

/** One series: parallel x and y arrays drawn as separate dots or as a joined line. */
export interface ChartSeries {
  readonly xs: readonly number[];
  readonly ys: readonly number[];
  readonly style: 'dots' | 'line';
  /** A name the view maps to a colour. */
  readonly tone: string;
}

export interface ChartAxis {
  /** Axis title including its unit, e.g. `period (s)`. */
  readonly label: string;
  /** Fixed range; otherwise taken from the data. */
  readonly range?: Range;
  /** Smallest span of an automatic range, so a flat series is not magnified into noise. */
  readonly minSpan?: number;
  /** Suffix written after each tick value, e.g. `°`. */
  readonly tickSuffix?: string;
}

export interface ChartSpec {
  /** Total width in characters, y tick labels included. */
  readonly width: number;
  /** Total height in lines: the title line, the plot rows, the axis line and the tick-label line. */
  readonly height: number;
  readonly x: ChartAxis;
  readonly y: ChartAxis;
  /** Drawn in order; where two series share a cell, the later one's tone wins. */
  readonly series: readonly ChartSeries[];
  /** Shown in the middle of an empty plot. */
  readonly emptyText?: string;
}

/** A piece of a chart line with its tone: `axis`, `label`, `blank` or a series tone. */
export interface ChartRun {
  readonly text: string;
  readonly tone: string;
}
export type ChartLine = readonly ChartRun[];

const MIN_PLOT_COLS = 8;

function fmtTick(v: number, decimals: number, suffix: string): string {
  return `${v.toFixed(decimals)}${suffix}`;
}

/** Renders a chart to exactly `spec.height` lines of exactly `spec.width` characters each. */
export function renderChart(spec: ChartSpec): ChartLine[] {
  const width = Math.max(MIN_PLOT_COLS + 8, Math.floor(spec.width));
  const plotRows = Math.max(1, Math.floor(spec.height) - 3);
  const allX = spec.series.flatMap((s) => s.xs);
  const allY = spec.series.flatMap((s) => s.ys);
  const xr = spec.x.range ?? dataRange(allX, 0.03, spec.x.minSpan ?? 0);
  const yr = spec.y.range ?? dataRange(allY, 0.08, spec.y.minSpan ?? 0);

  const yTicks = yr ? niceTicks(yr, Math.max(1, Math.floor(plotRows / 2))) : { values: [], decimals: 0 };
  const ySuffix = spec.y.tickSuffix ?? '';
  const yLabels = yTicks.values.map((v) => fmtTick(v, yTicks.decimals, ySuffix));
  const gutter = Math.max(1, ...yLabels.map((l) => l.length));
  const cols = width - gutter - 1;

  const lines: ChartLine[] = [];
  lines.push([{ text: spec.y.label.slice(0, width).padEnd(width), tone: 'label' }]);

  const canvas = createCanvas(cols, plotRows);
  const dotW = cols * 2 - 1;
  const dotH = plotRows * 4 - 1;
  const px = (x: number): number => (xr ? ((x - xr.min) / (xr.max - xr.min)) * dotW : NaN);
  const py = (y: number): number => (yr ? ((yr.max - y) / (yr.max - yr.min)) * dotH : NaN);
  spec.series.forEach((s, tone) => {
    const n = Math.min(s.xs.length, s.ys.length);
    let prev: [number, number] | null = null;
    for (let i = 0; i < n; i++) {
      const x = px(s.xs[i]!);
      const y = py(s.ys[i]!);
      if (!Number.isFinite(x) || !Number.isFinite(y)) {
        prev = null;
        continue;
      }
      if (s.style === 'line' && prev) drawLine(canvas, prev[0], prev[1], x, y, tone);
      else setDot(canvas, x, y, tone);
      prev = [x, y];
    }
  });

  const tickRow = new Map<number, string>();
  if (yr) yTicks.values.forEach((v, i) => tickRow.set(Math.min(plotRows - 1, Math.floor(py(v) / 4)), yLabels[i]!));
  const empty = allX.length === 0 || !xr || !yr;
  const emptyRow = Math.floor((plotRows - 1) / 2);
  for (let row = 0; row < plotRows; row++) {
    const label = tickRow.get(row);
    const out: ChartRun[] = [
      { text: (label ?? '').padStart(gutter), tone: 'label' },
      { text: label !== undefined ? '┤' : '│', tone: 'axis' },
    ];
    if (empty && row === emptyRow && spec.emptyText) {
      const t = spec.emptyText.slice(0, cols);
      const left = Math.floor((cols - t.length) / 2);
      out.push({ text: ' '.repeat(left) + t + ' '.repeat(cols - left - t.length), tone: 'blank' });
    } else {
      for (const run of canvasRowRuns(canvas, row)) {
        out.push({ text: run.tone < 0 ? ' '.repeat(run.text.length) : run.text, tone: run.tone < 0 ? 'blank' : spec.series[run.tone]!.tone });
      }
    }
    lines.push(out);
  }

  lines.push(...xAxisLines(spec, xr, px, width, gutter, cols));
  return lines;
}

/** The x axis with its ticks, and the line of tick values with the x title at its right end. */
function xAxisLines(spec: ChartSpec, xr: ReturnType<typeof dataRange>, px: (x: number) => number, width: number, gutter: number, cols: number): ChartLine[] {
  const axis = ['└', ...'─'.repeat(cols)];
  // The x title sits at the right end of the tick-label line; tick values that would touch it are left out.
  const xLabel = spec.x.label.slice(0, width);
  const labelStart = width - xLabel.length;
  const under = Array.from({ length: width }, () => ' ');
  if (xr) {
    const xTicks = niceTicks(xr, Math.max(2, Math.floor(cols / 8)));
    const xSuffix = spec.x.tickSuffix ?? '';
    let freeFrom = 0;
    for (const v of xTicks.values) {
      const c = 1 + Math.min(cols - 1, Math.max(0, Math.floor(px(v) / 2)));
      axis[c] = '┬';
      const text = fmtTick(v, xTicks.decimals, xSuffix);
      const start = Math.max(freeFrom, gutter + c - Math.floor(text.length / 2));
      if (start + text.length > labelStart - 1) continue;
      for (let k = 0; k < text.length; k++) under[start + k] = text[k]!;
      freeFrom = start + text.length + 1;
    }
  }
  for (let k = 0; k < xLabel.length; k++) under[labelStart + k] = xLabel[k]!;
  return [
    [{ text: ' '.repeat(gutter), tone: 'label' }, { text: axis.join(''), tone: 'axis' }],
    [{ text: under.join(''), tone: 'label' }],
  ];
}

/** The chart as plain text (tones dropped), for tests and the plain fallback. */
export function chartText(lines: readonly ChartLine[]): string {
  return lines.map((l) => l.map((r) => r.text).join('')).join('\n');
}
