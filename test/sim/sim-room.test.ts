// The simulated room: readings as the firmware sends them, and a pendulum whose length and air follow the room.
import { describe, expect, it } from 'vitest';
import type { AirRecord, EdgeRecord, SensorRecord } from '../../protocol/records.ts';
import { DeviceClock } from '../../sim/device-clock.ts';
import { clockExcursion, physicsIn, roomAt } from '../../sim/room.ts';
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

  it('a device clock with a temperature coefficient: ticks are the integral of the rate, and the edges map back through it', () => {
    // 10 ppm/K, a 16 MHz ceramic resonator's order (docs/references.md#ref-clock-sources): ±20 ppm over this room.
    const warm = testScenario({ room: { ...room, clock_tempco_ppm_per_K: 10 }, rig: sc.rig, duration_s: 400, physics: { g_m_s2: 9.80665, release_deg: 5 } });
    const ex = clockExcursion(warm.room!)!;
    const clock = new DeviceClock(16e6, 300, 0, 2, 0.25, ex);
    // The integral by the midpoint rule against the closed form, and the inverse.
    let sum = 0;
    const n = 20000;
    for (let i = 0; i < n; i++) sum += 1 + 300e-6 + ex.rate(2 + (i + 0.5) * (360 / n));
    expect(clock.ticksAt(362)).toBeCloseTo(16e6 * sum * (360 / n) + 0.25, 1);
    expect(clock.timeAt(clock.ticksAt(123.456))).toBeCloseTo(123.456, 9);
    expect(ex.rate(90) / 1e-6).toBeCloseTo(10 * (roomAt(warm.room!, 90).tempC - 21), 9);
    const r = decodeRun(warm, 3);
    const boot = r.truth.clock.boots[0]!;
    const truthTimes = r.truth.passes.enter_s.flatMap((s, i) => [s, r.truth.passes.exit_s[i]!]).map((s) => s + r.truth.release_host_s);
    const e = r.records.filter((x) => x.record.kind === 'E').map((x) => x.record as EdgeRecord);
    const worst = (c: DeviceClock): number =>
      Math.max(...e.map((x, i) => Math.abs(c.timeAt(x.ticks - r.truth.clock.capture_latency_ticks + 0.5) - truthTimes[i]! - (x.edge === 'f' ? 2e-6 : 8e-6))));
    // Through the warm clock: the gate's 2 µs jitter (5σ) and half a tick; without the excursion: off by ~1 ms.
    expect(worst(new DeviceClock(16e6, 0, 0, boot.host_s, boot.phase_ticks, ex))).toBeLessThan(10e-6 + 31.25e-9);
    expect(worst(new DeviceClock(16e6, 0, 0, boot.host_s, boot.phase_ticks))).toBeGreaterThan(5e-4);
  });
});
