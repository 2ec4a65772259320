// The benchmark's result rows and how they are printed: figure, measured value, baseline, ratio, target.

/** One row of the table. `value`/`baseline` are numbers in `unit`; null when not measured. */
export interface Row {
  readonly figure: string;
  readonly value: number | null;
  readonly unit: string;
  /** What the baseline is, e.g. "read lines, no work". */
  readonly baselineName?: string;
  readonly baseline?: number | null;
  readonly baselineUnit?: string;
  /** value / baseline, or a ratio defined by the figure (say which in `note`). */
  readonly ratio?: number | null;
  /** Human target, e.g. "< 1.5 s". */
  readonly target?: string;
  /** Whether the target is met; undefined when there is no target. */
  readonly met?: boolean;
  readonly note?: string;
}

/** A benchmark's output: its rows, or the reason it could not be measured. */
export interface FigureResult {
  readonly id: string;
  readonly title: string;
  readonly rows: readonly Row[];
  /** Set when the figure could not be measured at all. */
  readonly notMeasured?: string;
  /** Extra numbers for results.json (distributions, per-size data). */
  readonly details?: Record<string, unknown>;
  readonly wallS?: number;
}

/** Formats a number with about four significant digits, in plain or exponent form. */
export function fmt(v: number | null | undefined): string {
  if (v === null || v === undefined || Number.isNaN(v)) return '—';
  if (!Number.isFinite(v)) return v > 0 ? '∞' : '−∞';
  const a = Math.abs(v);
  if (a === 0) return '0';
  if (a >= 1e6 || a < 1e-3) return v.toExponential(3);
  if (Number.isInteger(v)) return String(v);
  return v.toPrecision(4);
}

function withUnit(v: number | null | undefined, unit: string | undefined): string {
  const s = fmt(v);
  return s === '—' || !unit ? s : `${s} ${unit}`;
}

/** Renders the results as a Markdown table (readable in a terminal and pasteable into a README). */
export function renderTable(results: readonly FigureResult[]): string {
  const head = ['figure', 'measured', 'baseline', 'ratio', 'target', 'met'];
  const rows: string[][] = [];
  for (const r of results) {
    if (r.notMeasured !== undefined) {
      rows.push([`${r.id}: ${r.title}`, `not measured (${r.notMeasured})`, '', '', '', '']);
      continue;
    }
    for (const row of r.rows) {
      const base = row.baselineName === undefined ? '' : `${row.baselineName}: ${withUnit(row.baseline, row.baselineUnit ?? row.unit)}`;
      const met = row.met === undefined ? '' : row.met ? 'yes' : 'NO';
      rows.push([`${r.id}: ${row.figure}`, withUnit(row.value, row.unit), base, row.ratio === undefined ? '' : fmt(row.ratio), row.target ?? '', met]);
    }
  }
  const line = (cells: readonly string[]): string => `| ${cells.map((c) => c.replace(/\|/g, '\\|')).join(' | ')} |`;
  return [line(head), line(head.map(() => '---')), ...rows.map(line)].join('\n');
}

/** Notes of the rows, numbered by figure, printed under the table. */
export function renderNotes(results: readonly FigureResult[]): string {
  const out: string[] = [];
  for (const r of results) for (const row of r.rows) if (row.note) out.push(`- ${r.id}, ${row.figure}: ${row.note}`);
  return out.join('\n');
}
