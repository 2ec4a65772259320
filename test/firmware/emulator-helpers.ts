// Helpers for the emulator tests: seeded RNG, decoding a run, matching edges to applied changes.
import { expect } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import type { DeviceRecord, EdgeRecord, HeartbeatRecord } from '../../protocol/records.ts';
import type { FirmwareRun } from '../../sim/emulator/run-firmware.ts';

/** mulberry32: small seeded PRNG for reproducible schedules. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Decodes every line, asserting none is rejected and seq runs without a gap from 0. */
export function decodeRun(run: FirmwareRun): DeviceRecord[] {
  const records = run.lines.map((line) => {
    const r = decodeLine(line);
    if (!r.ok) throw new Error(`rejected device line ${JSON.stringify(line)}: ${r.reason} (${r.detail})`);
    return r.record;
  });
  records.forEach((r, i) => expect(r.seq, `seq of line ${i}`).toBe(i % 0x10000));
  return records;
}

export const edgesOf = (records: readonly DeviceRecord[], ch?: number): EdgeRecord[] =>
  records.filter((r): r is EdgeRecord => r.kind === 'E' && (ch === undefined || r.ch === ch));

export const heartbeatsOf = (records: readonly DeviceRecord[]): HeartbeatRecord[] =>
  records.filter((r): r is HeartbeatRecord => r.kind === 'T');

/** Cycle minus reported ticks for each edge of channel ch, pairing edges and applied changes in order. */
export function latencies(run: FirmwareRun, records: readonly DeviceRecord[], ch: 0 | 1): number[] {
  const applied = run.applied.filter((a) => a.ch === ch && a.cycle > 0);
  const edges = edgesOf(records, ch);
  expect(edges.length, `ch${ch} edges reported vs applied`).toBe(applied.length);
  return edges.map((e, i) => {
    const a = applied[i]!;
    expect(e.edge, `ch${ch} edge ${i} polarity`).toBe(a.level ? 'r' : 'f');
    return a.cycle - run.timer1StartCycle - e.ticks;
  });
}

export function histogram(values: readonly number[]): Map<number, number> {
  const m = new Map<number, number>();
  for (const v of values) m.set(v, (m.get(v) ?? 0) + 1);
  return new Map([...m].sort((a, b) => a[0] - b[0]));
}
