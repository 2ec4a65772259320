// A burst faster than the UART can carry: nothing lost until the edge ring is full, then every missing
// edge is counted in `lost`, and the firmware recovers when the burst ends.
import { beforeAll, expect, it } from 'vitest';
import { EDGE_RING_CAPACITY } from '../../protocol/link-defaults.ts';
import { EMULATOR_HZ, runFirmware, type FirmwareEdge, type FirmwareRun } from '../../sim/emulator/run-firmware.ts';
import { decodeRun, edgesOf, heartbeatsOf } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const BURST_EDGES = 2000;
const SPACING_S = 50e-6;
const BURST_START_S = 1.0;

describeFirmware('edge burst beyond the UART rate', () => {
  let run: FirmwareRun;

  beforeAll(async () => {
    const edges: FirmwareEdge[] = [];
    for (let i = 0; i < BURST_EDGES; i++) {
      edges.push({ t_s: BURST_START_S + i * SPACING_S, ch: 0, level: i % 2 === 0 ? 1 : 0 });
    }
    // After the burst: two ordinary pulses on ch0 and one on ch1.
    for (const t of [2.5, 2.6]) edges.push({ t_s: t, ch: 0, level: 1 }, { t_s: t + 0.01, ch: 0, level: 0 });
    edges.push({ t_s: 2.7, ch: 1, level: 1 }, { t_s: 2.71, ch: 1, level: 0 });
    run = await runFirmware({ edges, durationS: 4.2 });
  }, 60_000);

  it('lost equals exactly the number of burst edges missing from the output', () => {
    const records = decodeRun(run);
    const beats = heartbeatsOf(records);
    const burstEnd = (BURST_START_S + BURST_EDGES * SPACING_S) * EMULATOR_HZ - run.timer1StartCycle;
    const burst = edgesOf(records, 0).filter((e) => e.ticks <= burstEnd);
    const lost = beats.at(-1)!.lost;
    expect(lost).toBeGreaterThan(0);
    expect(burst.length + lost).toBe(BURST_EDGES);
  });

  it('every edge that comes back is a real one, exact to the tick, and the first ones are all there', () => {
    const records = decodeRun(run);
    const byTick = new Map(run.applied.filter((a) => a.ch === 0).map((a) => [a.cycle - run.timer1StartCycle, a.level]));
    const got = edgesOf(records, 0);
    for (const e of got) expect(byTick.get(e.ticks), `edge at ${e.ticks}`).toBe(e.edge === 'r' ? 1 : 0);
    // Nothing is dropped before the ring (EDGE_RING_CAPACITY entries) has filled: the first missing
    // edge comes after at least that many.
    const applied0 = run.applied.filter((a) => a.ch === 0).map((a) => a.cycle - run.timer1StartCycle);
    let firstMissing = 0;
    while (firstMissing < got.length && got[firstMissing]!.ticks === applied0[firstMissing]) firstMissing++;
    expect(firstMissing).toBeGreaterThanOrEqual(EDGE_RING_CAPACITY);
    expect(firstMissing).toBeLessThan(BURST_EDGES);
  });

  it('recovers after the burst: later edges on both channels come back and lost stops growing', () => {
    const records = decodeRun(run);
    const after = (2.4 * EMULATOR_HZ) - run.timer1StartCycle;
    expect(edgesOf(records, 0).filter((e) => e.ticks > after).map((e) => e.edge)).toEqual(['r', 'f', 'r', 'f']);
    expect(edgesOf(records, 1).map((e) => e.edge)).toEqual(['r', 'f']);
    const beats = heartbeatsOf(records);
    expect(beats.length).toBeGreaterThanOrEqual(3);
    expect(new Set(beats.slice(1).map((b) => b.lost)).size).toBe(1);
  });
});
