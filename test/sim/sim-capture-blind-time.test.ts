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

// Emulated firmware (sim/emulator harness, ch0), this session: r then f after 24 ticks → only r, lost 1; after
// 26 ticks → both (sim-emulator.test.ts re-measures this on the current firmware); r, f after 20, r after 100 → only r, lost 0; the same with r after 200 → r r, lost 1.
describe('capture blind time (values measured on the emulated firmware)', () => {
  it('a pulse of 24 ticks loses its end and counts it; 26 ticks is captured whole', () => {
    expect(capture([[0, 24]])).toMatchObject({ edges: 'r', lost: 1 });
    expect(capture([[0, 26]])).toMatchObject({ edges: 'rf', lost: 0 });
  });

  it('a missed pulse that is over before the pin check vanishes without a count; one that is not is counted', () => {
    const silent = capture([[0, 20, 100, 2000]]);
    expect(silent).toMatchObject({ edges: 'rf', lost: 0 });
    expect(silent.counts.edges_lost_silently).toBe(2);
    const counted = capture([[0, 20, 200, 2000]]);
    expect(counted).toMatchObject({ edges: 'rrf', lost: 1 });
    expect(counted.counts.edges_lost_too_close).toBe(1);
  });
});
