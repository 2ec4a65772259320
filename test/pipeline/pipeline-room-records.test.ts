// A and S records (room readings, sensor state) pass through the journal and the pipeline without moving
// anything else: the same run with and without them analyses to the same result.
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { type JournalEntry } from '../../protocol/journal.ts';
import type { DeviceRecord } from '../../protocol/records.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { loadScenario } from '../../sim/index.ts';
import { simAndAnalyze } from './sim-run.ts';

/** Re-numbers the data lines' seq from 0, inserting `extra(record)` lines after chosen records. */
function renumber(entries: readonly JournalEntry[], extra: (r: DeviceRecord, i: number) => DeviceRecord[]): JournalEntry[] {
  let seq = 0;
  const out: JournalEntry[] = [];
  entries.forEach((e, i) => {
    if (e.kind !== 'data') return void out.push(e);
    const d = decodeLine(e.line);
    if (!d.ok) return void out.push(e);
    for (const r of [d.record, ...extra(d.record, i)]) {
      out.push({ ...e, line: encodeRecord({ ...r, seq: seq++ % 0x10000 }) });
    }
  });
  return out;
}

describe('room records in a run', () => {
  it('A and S lines between the others change no figure of the analysis and are not unknown kinds', () => {
    const { entries } = simAndAnalyze(loadScenario('demo-low-q'), { seed: 4, durationS: 240 });
    const plain = renumber(entries, () => []);
    let n = 0;
    const withRoom = renumber(entries, (r, i) => {
      if (r.kind === 'H') return [{ kind: 'S', seq: 0, state: 0 }];
      if (r.kind !== 'T' || i % 10 !== 0) return [];
      n++;
      return [{ kind: 'A', seq: 0, ticks: r.ticks + 1000, temp: 2100 + (n % 7), press: 101325 - n, hum: 45000 + n }];
    });
    expect(n).toBeGreaterThan(20);
    const a = analyzeEntries(plain);
    const b = analyzeEntries(withRoom);
    expect(b.counts.unknown_kinds).toBe(0);
    expect(b.counts.lines_lost).toBe(0);
    expect({ ...b, environment: undefined }).toEqual({ ...a, environment: undefined });
  });
});
