// Helpers for the emulator tests: seeded RNG, decoding a run, matching edges to applied changes.
import { expect } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import type { DeviceRecord, EdgeRecord, HeartbeatRecord } from '../../protocol/records.ts';
import { EMULATED_CALIBRATION, calibrationBytes, rawReading } from '../../sim/emulator/room-sensor.ts';
import { runFirmware, type EmulatedRoomSensor, type FirmwareRun, type RunFirmwareOptions } from '../../sim/emulator/run-firmware.ts';

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

/**
 * A room sensor read every second (`A 1` at 0.06 s) and the due time of each reading, for edges aimed at the
 * firmware's compare-B wake-up. The firmware arms compare-B at a due time's low 16 bits in the overflow period
 * before it (firmware/src/main.c arm_room_wake), so a run stopped 2 ms before a reading shows them in OCR1B;
 * the due times are one second apart (firmware/src/room.c), which gives the rest.
 */
export async function readingsEverySecond(): Promise<{ options: Pick<RunFirmwareOptions, 'room' | 'commands'>; start: number; due: (k: number) => number }> {
  const room: EmulatedRoomSensor = { addr: 0x76, calib: calibrationBytes(EMULATED_CALIBRATION), samples: [rawReading(EMULATED_CALIBRATION, 0, 21, 101325, 45)] };
  const options = { room, commands: [{ t_s: 0.06, text: 'A 1\n' }] };
  const probe = await runFirmware({ edges: [], durationS: 2.5, ...options });
  const taken = decodeRun(probe).flatMap((r) => (r.kind === 'A' ? [r.ticks] : []));
  // Readings at the command (~0.06 s), ~1.06 s and ~2.06 s; the next is taken about 3.06 s after reset.
  expect(taken).toHaveLength(4);
  const next = taken.at(-1)! + probe.hz;
  const stopped = await runFirmware({ edges: [], durationS: (probe.timer1StartCycle + next - 0.002 * probe.hz) / probe.hz, ...options });
  const r = stopped.registers;
  expect(r.TIMSK1! & 0x04, 'OCIE1B on 2 ms before a reading').toBe(0x04);
  const phase = r.OCR1BL! | (r.OCR1BH! << 8);
  // The reading is taken after its due time by the trigger's bus write (0.3 ms): the due time is the tick
  // with that phase in the millisecond before.
  const dueNext = next - ((((next - phase) % 65536) + 65536) % 65536);
  expect(next - dueNext).toBeLessThan(0.001 * probe.hz);
  return { options, start: probe.timer1StartCycle, due: (k) => dueNext + (k - 3) * probe.hz };
}
