// The device model's capture blind time, against what the emulated firmware did with the same pulses.
import { describe, expect, it } from 'vitest';
import { decodeLine, type EdgeRecord, type HeartbeatRecord } from '../../protocol/index.ts';
import { DeviceModel } from '../../sim/device.ts';
import { emptyCounts } from '../../sim/truth.ts';
import { Rng } from '../../sim/prng.ts';
import { testScenario } from './sim-fixtures.ts';

/** Runs the model on hand-made pin edges (ticks after boot, on an exact 16 MHz clock). */
function capture(pulses: readonly (readonly number[])[]) {
  const s = testScenario();
  const device = { ...s.device, emit_latency_us: [0, 0] as const };
  const boot = device.first_boot_s;
  const edges: { t: number; level: 0 | 1 }[] = [];
  pulses.forEach((offsets, i) => offsets.forEach((dt, k) => edges.push({ t: boot + 1 + i * 0.01 + dt / 16e6, level: (k % 2 === 0 ? 1 : 0) as 0 | 1 })));
  const counts = emptyCounts();
  const schedule = { reboots: [], stalls: [], drops: [], disconnects: [], objects: [] };
  const m = new DeviceModel({ device, channel: 0, initialLevel: 0, schedule, rng: new Rng(1), counts, boots: [], tEnd: boot + 2.5 }, edges[Symbol.iterator]());
  const recs = [];
  for (let l = m.pop(); l; l = m.pop()) {
    const d = decodeLine(l.line);
    if (d.ok) recs.push(d.record);
  }
  const e = recs.filter((r) => r.kind === 'E') as EdgeRecord[];
  const lost = (recs.filter((r) => r.kind === 'T') as HeartbeatRecord[]).at(-1)!.lost;
  return { edges: e.map((x) => x.edge).join(''), lost, counts };
}

// Emulated firmware (sim/emulator harness, ch0), this session: r then f after 26 ticks → only r, lost 1; after
// 28 ticks → both (sim-emulator.test.ts re-measures this on the current firmware); r, f after 20, r after 100 →
// only r, lost 2 (the re-arm is at 122 ticks); the same with r after 200 → r r, lost 1.
describe('capture blind time (values measured on the emulated firmware)', () => {
  it('a pulse of 26 ticks loses its end and counts it; 28 ticks is captured whole', () => {
    expect(capture([[0, 26]])).toMatchObject({ edges: 'r', lost: 1 });
    expect(capture([[0, 28]])).toMatchObject({ edges: 'rf', lost: 0 });
  });

  it('edges missed before the re-arm are counted: one, or two when a missed pulse is over by then', () => {
    const both = capture([[0, 20, 100, 2000]]);
    expect(both).toMatchObject({ edges: 'rf', lost: 2 });
    expect(both.counts.edges_lost_silently).toBe(0);
    const counted = capture([[0, 20, 200, 2000]]);
    expect(counted).toMatchObject({ edges: 'rrf', lost: 1 });
    expect(counted.counts.edges_lost_too_close).toBe(1);
  });

  it('after two missed edges the next one is captured, even before the re-arm', () => {
    // r, f at 20 (before the flip), r at 60 (the flipped select awaits a fall), f at 90: captured.
    const third = capture([[0, 20, 60, 90, 2000, 4000]]);
    expect(third).toMatchObject({ edges: 'rfrf', lost: 2 });
    expect(third.counts.edges_lost_silently).toBe(0);
  });
});
