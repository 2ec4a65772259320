// The per-swing CSV of `analyze --csv`: one row per pass, SI units, empty cells for unknown values.
import type { SwingRow } from '../analysis/result.ts';

/**
 * The CSV header line (columns: docs/swings-csv.md). azimuth_deg and minor_axis_m are empty for one-beam runs
 * (docs/two-beam-geometry.md); the room's three are empty without room readings (A records) and across gaps in them.
 */
export const SWINGS_CSV_HEADER = 'index,t_s,transit_s,half_period_s,period_s,amplitude_deg,period0_s,flags,azimuth_deg,minor_axis_m,temperature_C,pressure_Pa,humidity_pct';

const num = (v: number | null, digits: number): string => (v === null ? '' : v.toFixed(digits));

/** One CSV line of a swing row (no newline). */
function csvLine(r: SwingRow): string {
  return `${r.index},${r.t_s.toFixed(7)},${r.transit_s.toFixed(9)},${num(r.half_period_s, 9)},${num(r.period_s, 9)},${num(r.amplitude_deg, 5)},${num(r.period0_s, 9)},${r.flags.join(' ')},${num(r.azimuth_deg ?? null, 4)},${num(r.minor_axis_m ?? null, 7)},${num(r.temperature_C ?? null, 3)},${num(r.pressure_Pa ?? null, 1)},${num(r.humidity_pct ?? null, 3)}`;
}

/** The CSV in chunks of about `linesPerChunk` lines (header first, every line ending in a newline), for streaming. */
export function* swingsCsvChunks(rows: readonly SwingRow[], linesPerChunk = 2000): Generator<string> {
  let chunk = `${SWINGS_CSV_HEADER}\n`;
  for (let i = 0; i < rows.length; i++) {
    chunk += `${csvLine(rows[i]!)}\n`;
    if ((i + 1) % linesPerChunk === 0) {
      yield chunk;
      chunk = '';
    }
  }
  if (chunk) yield chunk;
}

