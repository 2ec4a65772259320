// The simulated room: readings as the firmware sends them, and a pendulum whose length and air follow the room.
import { describe, expect, it } from 'vitest';
import type { AirRecord, SensorRecord } from '../../protocol/records.ts';
import { physicsIn, roomAt } from '../../sim/room.ts';
import { decodeRun, testScenario } from './sim-fixtures.ts';

// A fast cycle (6 min) so that a short run sees it; a large coefficient so that a few minutes resolve it.
const room = { temp_period_h: 0.1, temp_amp_K: 2, expansion_per_K: 1e-4, front_at_h: 0.05, front_width_h: 0.01, interval_s: 10 };
const sc = testScenario({ room, rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254, bob_density_kg_m3: 8000 }, duration_s: 400, physics: { g_m_s2: 9.80665, release_deg: 5 } });

describe('simulated room', () => {
  const run = decodeRun(sc, 3);
  const air = run.records.filter((r) => r.record.kind === 'A').map((r) => r.record as AirRecord);

  it('sends S 0 after the hello and a reading every 10 s of device time, rounded as the firmware sends it', () => {
    const kinds = run.records.map((r) => r.record.kind).filter((k) => k !== 'E' && k !== 'T');
    expect(kinds.slice(0, 3)).toEqual(['H', 'S', 'A']);
    expect((run.records.find((r) => r.record.kind === 'S')!.record as SensorRecord).state).toBe(0);
    expect(air.length).toBeGreaterThanOrEqual(39);
    air.slice(1).forEach((a, i) => expect(a.ticks - air[i]!.ticks).toBe(10 * 16e6));
    const boot = run.truth.clock.boots[0]!.host_s;
    for (const a of air) {
      const c = roomAt(sc.room!, boot + a.ticks / 16e6);
      expect(Math.abs(a.temp - c.tempC * 100)).toBeLessThanOrEqual(0.5);
      expect(Math.abs(a.press - c.pressPa)).toBeLessThanOrEqual(0.5);
      expect(Math.abs(a.hum - c.rhPct * 1000)).toBeLessThanOrEqual(0.5);
    }
    expect(Math.max(...air.map((a) => a.temp)) - Math.min(...air.map((a) => a.temp))).toBeGreaterThan(390);
    expect(Math.min(...air.map((a) => a.press))).toBeLessThan(101325 - 850);
  });

  it('swings with the period of the length and air density at each moment (exact half-periods of the truth)', () => {
    const enter = run.truth.passes.enter_s;
    const exit = run.truth.passes.exit_s;
    const t0 = run.truth.release_host_s;
    let worst = 0;
    const ratios: number[] = [];
    const mid = (i: number): number => (enter[i]! + exit[i]!) / 2;
    for (let k = 1; k + 2 < exit.length; k++) {
      // A full period (two passes on); the gate's offset alternates the half-periods, not their sum.
      const period = mid(k + 2) - mid(k);
      const want = physicsIn(sc, sc.room!, roomAt(sc.room!, t0 + mid(k + 1))).T0_s;
      ratios.push(period / want);
    }
    // At 5° (no damping) T/T0 is one constant (docs/references.md#ref-period-ratio): after dividing out the
    // room's T0, the ratio is flat, while the room moved T0 by 2 K × 1e-4/K / 2 = 1e-4 each way.
    const mean = ratios.reduce((a, b) => a + b, 0) / ratios.length;
    // The integrator holds ω0 over each half-swing; this 6-minute cycle moves T0 by up to 1.7e-6 per second
    // (a real day: 1e-9), hence the tolerance.
    for (const r of ratios) expect(Math.abs(r / mean - 1)).toBeLessThan(6e-6);
    expect(mean - 1).toBeCloseTo((5 * Math.PI / 180) ** 2 / 16, 5);
    const t0s = enter.map((_, k) => physicsIn(sc, sc.room!, roomAt(sc.room!, t0 + mid(k))).T0_s);
    expect(Math.max(...t0s) / Math.min(...t0s) - 1).toBeGreaterThan(1.5e-4);
  });
});
