import { describe, expect, it } from 'vitest';
import { bootOffsets, clockRateFromHost, clockRateFromPps } from '../../host/analysis/clock-calibration.ts';
import { linearFit } from '../../host/analysis/least-squares.ts';
import { TestRng } from './seeded-rng.ts';

/** Heartbeats every second of a device running `ppm` fast, received after a 1 ms USB frame plus exponential latency. */
function beats(ppm: number, seconds: number, rng: TestRng, extraLatency: (t: number) => number = () => 0) {
  const dev: number[] = [];
  const host: number[] = [];
  const framePhase = rng.uniform() * 1e-3;
  for (let k = 0; k < seconds; k++) {
    const trueT = 5 + k;
    const ticksS = trueT * (1 + ppm * 1e-6); // nominal device seconds shown by the tick counter
    const framed = framePhase + Math.ceil((trueT - framePhase) / 1e-3) * 1e-3;
    dev.push(ticksS);
    host.push(framed + rng.exponential(150e-6) + extraLatency(trueT));
  }
  return { boot: 0, deviceS: dev, hostS: host };
}

describe('device clock rate from heartbeats (lower envelope of one-sided latency)', () => {
  it('recovers the rate within its stated uncertainty and within 2 ppm over 2 hours', () => {
    let inside = 0;
    const seeds = 20;
    for (let seed = 1; seed <= seeds; seed++) {
      const rng = new TestRng(seed);
      const ppm = (rng.uniform() - 0.5) * 6000;
      const r = clockRateFromHost([beats(ppm, 7200, rng)])!;
      expect(Math.abs(r.ppm - ppm)).toBeLessThan(2);
      if (Math.abs(r.ppm - ppm) < 2 * r.u_ppm) inside++;
    }
    // Coverage of the k = 2 interval; the window minima are not Gaussian, so allow a wide margin.
    expect(inside).toBeGreaterThanOrEqual(14);
  });

  it('is not pulled by latency that grows during the run, where a least-squares line is', () => {
    const rng = new TestRng(7);
    // A busier host later in the run: typical latency rises by up to 10 ms over an hour, the minimum stays.
    const b = beats(100, 3600, rng, (t) => (rng.uniform() < 0.7 ? (t / 3600) * 10e-3 * rng.uniform() : 0));
    const r = clockRateFromHost([b])!;
    expect(Math.abs(r.ppm - 100)).toBeLessThan(0.5);
    const ls = linearFit(b.deviceS.length, (i) => b.hostS[i]! - b.deviceS[i]!, [() => 1, (i) => b.deviceS[i]!])!;
    const lsPpm = -ls.params[1]! / (1 + ls.params[1]!) * 1e6;
    expect(Math.abs(lsPpm - 100)).toBeGreaterThan(0.8);
  });

  it('pools boots with separate offsets, and the offsets join the timebases on the host clock', () => {
    const rng = new TestRng(3);
    const a = beats(-250, 1800, rng);
    const b = beats(-250, 1800, rng);
    const shifted = { boot: 1, deviceS: b.deviceS.map((x) => x - 4000 * (1 - 250e-6)), hostS: b.hostS.map((h) => h + 2000) };
    const r = clockRateFromHost([a, shifted])!;
    expect(Math.abs(r.ppm + 250)).toBeLessThan(1);
    const off = bootOffsets([a, shifted], r.ppm);
    // Boot 1's tick 0 is at host 2000 + 4000 + 5 … in this construction: its offset differs from boot 0's by 6000 s.
    expect(off.get(1)! - off.get(0)!).toBeCloseTo(6000, 2);
  });

  it('gives a drifting rate as its mean over the heartbeats, exactly when there is no latency', () => {
    // A device second at a time, rate 1 + (ppm + drift·h/3600)·1e-6 at host time h: device seconds x(h) =
    // (1 + p)h + q·h²/2, so the rate's mean over the beats is p + q·(h_first + h_last)/2 (exact for a linear drift).
    // Window minima of h − x sat at one end of each window (75 ms across 25 s at 3000 ppm) and a last window of one
    // beat added a point at the end: +0.126 ppm at +20 ppm/h over 20 minutes, where this asks for 1e-3.
    for (const [ppm, drift] of [[3000, 20], [3000, -20], [0, 20], [-3000, 20]] as const) {
      const p = ppm * 1e-6;
      const q = (drift * 1e-6) / 3600;
      const deviceS: number[] = [];
      const hostS: number[] = [];
      for (let n = 1; n < 1200; n++) deviceS.push(n), hostS.push((-(1 + p) + Math.sqrt((1 + p) ** 2 + 2 * q * n)) / q);
      const truth = ppm + (drift * (hostS[0]! + hostS.at(-1)!)) / 2 / 3600;
      expect(Math.abs(clockRateFromHost([{ boot: 0, deviceS, hostS }])!.ppm - truth), `${ppm} ppm, ${drift} ppm/h`).toBeLessThan(1e-3);
    }
  });

  it('is null when there are too few heartbeats', () => {
    expect(clockRateFromHost([{ boot: 0, deviceS: [1, 2, 3], hostS: [1, 2, 3] }])).toBeNull();
  });
});

describe('device clock rate from a 1 PPS input', () => {
  it('counts whole seconds even with a resonator 3000 ppm off and recovers the rate to ~1e-3 ppm', () => {
    const rng = new TestRng(11);
    const hz = 16e6;
    const ppm = 3000;
    const ticks = Array.from({ length: 600 }, (_, k) => Math.round((12.3 + k) * hz * (1 + ppm * 1e-6) + rng.normal() * 2));
    const r = clockRateFromPps([{ boot: 0, ticks }], hz)!;
    expect(r.pulses).toBe(600);
    expect(Math.abs(r.ppm - ppm)).toBeLessThan(3 * r.u_ppm + 1e-6);
    expect(r.u_ppm).toBeLessThan(0.01);
  });

  it('refuses pulses that are not about a second apart', () => {
    const ticks = Array.from({ length: 50 }, (_, k) => k * 8e6);
    expect(clockRateFromPps([{ boot: 0, ticks }], 16e6)).toBeNull();
  });
});
