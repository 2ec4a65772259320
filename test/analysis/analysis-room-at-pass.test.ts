// The room per pass in the per-swing CSV (#18): the simulator's room (its known schedule) read back at each pass,
// gaps in the readings left empty, and no room columns filled without A records.
import { describe, expect, it } from 'vitest';
import { parseJournalLine } from '../../protocol/journal.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { roomAtTimes } from '../../host/analysis/room-at-pass.ts';
import { SWINGS_CSV_HEADER, swingsCsvChunks } from '../../host/output/swings-csv.ts';
import { loadScenario, parseScenario, simulateJournal } from '../../sim/index.ts';
import { roomAt, type RoomSetup } from '../../sim/room.ts';

/** The CSV as objects by column name (empty cells as null). */
function csvRows(text: string): Record<string, number | null>[] {
  const [head, ...lines] = text.trim().split('\n');
  const cols = head!.split(',');
  return lines.map((l) => Object.fromEntries(l.split(',').map((v, i) => [cols[i], v === '' || cols[i] === 'flags' ? null : Number(v)])));
}

describe('room columns of the per-swing CSV', () => {
  const base = loadScenario('demo-low-q');
  // A fast room: ±2 K over 15 minutes, so the temperature moves visibly between passes.
  const sc = parseScenario({ ...JSON.parse(JSON.stringify(base)), room: { temp_period_h: 0.25, interval_s: 10 } });
  const room = sc.room as RoomSetup;
  const { lines } = simulateJournal(sc, { seed: 5, durationS: 300 });
  const entries = [...lines].map(parseJournalLine);
  const r = analyzeEntries(entries);
  const rows = csvRows([...swingsCsvChunks(r.swings)].join(''));

  it('ends with temperature_C, pressure_Pa, humidity_pct after the plane columns', () => {
    expect(SWINGS_CSV_HEADER.split(',').slice(-5)).toEqual(['azimuth_deg', 'minor_axis_m', 'temperature_C', 'pressure_Pa', 'humidity_pct']);
  });

  it('gives the simulated room at each pass time', () => {
    const filled = rows.filter((x) => x.temperature_C !== null);
    expect(filled.length).toBeGreaterThan(0.95 * rows.length);
    for (const x of filled) {
      const truth = roomAt(room, x.t_s!);
      // Readings are sent to 0.01 K, 1 Pa, 0.001 %RH; linear interpolation over 10 s of a ±2 K, 15-minute sine
      // is off by at most (10 s)²/8·2 K·(2π/900 s)² = 0.0012 K; the reading's arrival lag adds ~ms.
      expect(Math.abs(x.temperature_C! - truth.tempC)).toBeLessThan(0.01);
      expect(Math.abs(x.pressure_Pa! - truth.pressPa)).toBeLessThan(1.1);
      expect(Math.abs(x.humidity_pct! - truth.rhPct)).toBeLessThan(0.01);
    }
    // The plot series carry the readings as sent.
    expect(r.plots.room!.t_s.length).toBeGreaterThan(25);
    expect(r.plots.t0VsTime!.T0_s.length).toBeGreaterThan(5);
  });

  it('leaves the room cells empty in a run without A records', () => {
    const plain = analyzeEntries([...simulateJournal(base, { seed: 5, durationS: 120 }).lines].map(parseJournalLine));
    const rs = csvRows([...swingsCsvChunks(plain.swings)].join(''));
    expect(rs.length).toBeGreaterThan(50);
    for (const x of rs) expect([x.temperature_C, x.pressure_Pa, x.humidity_pct]).toEqual([null, null, null]);
    expect(plain.plots.room).toBeUndefined();
  });
});

describe('roomAtTimes', () => {
  const reading = (t_s: number, tempC: number) => ({ t_s, tempC, pressPa: 1e5 + t_s, rhPct: 40 });
  const readings = [0, 10, 20, 30, 70, 80].map((t) => reading(t, 20 + t / 10));

  it('interpolates between readings, keeps one interval at the ends, and makes nothing up across a gap', () => {
    const c = roomAtTimes(readings, [5, 25, -5, -15, 85, 95, 50, 45]);
    expect(c.tempC[0]).toBeCloseTo(20.5, 12);
    expect(c.pressPa[1]).toBeCloseTo(1e5 + 25, 9);
    expect(c.tempC[2]).toBe(20); // 5 s before the first reading: within one 10 s interval
    expect(c.tempC[3]).toBeNaN(); // 15 s before it
    expect(c.tempC[4]).toBe(28);
    expect(c.tempC[5]).toBeNaN();
    // 40 s between readings is four intervals: more than a lost reading or two.
    expect(c.tempC[6]).toBeNaN();
    expect(c.tempC[7]).toBeNaN();
  });

  it('gives nothing from fewer than two readings, and copes with two at the same time', () => {
    expect(roomAtTimes([reading(0, 20)], [0]).tempC[0]).toBeNaN();
    const same = roomAtTimes([reading(0, 20), reading(0, 21), reading(10, 22)], [0, 5]);
    expect(Number.isFinite(same.tempC[0]!)).toBe(true);
    expect(same.tempC[1]).toBeCloseTo(21.5, 9); // from the later of the two at t = 0
  });
});
