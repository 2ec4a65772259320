// The per-swing CSV of `analyze --csv`: one row per pass, SI units, empty cells for unknown values.
import type { SwingRow } from './result.ts';

/** The CSV header line. */
export const SWINGS_CSV_HEADER = 'index,t_s,transit_s,half_period_s,period_s,amplitude_deg,period0_s,flags';

const num = (v: number | null, digits: number): string => (v === null ? '' : v.toFixed(digits));

/** Formats the swing rows as CSV text with a header and a final newline. */
export function swingsCsv(rows: readonly SwingRow[]): string {
  const out: string[] = [SWINGS_CSV_HEADER];
  for (const r of rows) {
    out.push(
      `${r.index},${r.t_s.toFixed(7)},${r.transit_s.toFixed(9)},${num(r.half_period_s, 9)},${num(r.period_s, 9)},${num(r.amplitude_deg, 5)},${num(r.period0_s, 9)},${r.flags.join(' ')}`,
    );
  }
  return `${out.join('\n')}\n`;
}
