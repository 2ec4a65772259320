// The device clock's rate tracked through the run (host/analysis/clock-track.ts): the spline's algebra against
// exact integrals, and the tracked rate against the rate that made the heartbeats (1 ms USB frames and one-sided
// latency, as in analysis-clock-calibration.test.ts).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clockRateFromHost } from '../../host/analysis/clock-calibration.ts';
import { excursionIntegral, hatIntegral, meanExcursion, rateExcursion, temperatureSlope, trackClockRate, trackedSeconds, type RateTrack } from '../../host/analysis/clock-track.ts';
import { TestRng } from './seeded-rng.ts';

/**
 * Heartbeats every second for `seconds` of true time: the tick counter runs at (1 + ppm·1e-6)(1 + e(t)), its reading
 * in nominal seconds is the integral (`E` = ∫ e dt in closed form), received after a 1 ms USB frame plus latency.
 */
function beats(ppm: number, seconds: number, rng: TestRng, E: (t: number) => number = () => 0) {
  const deviceS: number[] = [];
  const hostS: number[] = [];
  const framePhase = rng.uniform() * 1e-3;
  for (let k = 0; k < seconds; k++) {
    const t = 5 + k + rng.uniform() * 1e-4;
    deviceS.push((t + E(t) - E(5)) * (1 + ppm * 1e-6));
    hostS.push(framePhase + Math.ceil((t - framePhase) / 1e-3) * 1e-3 + rng.exponential(150e-6));
  }
  return { boot: 0, deviceS, hostS };
}

const track = (e: number[], d = 100): RateTrack => ({
  k0: 1,
  knots_s: e.map((_, j) => 50 + j * d),
  from_s: 50,
  to_s: 50 + (e.length - 1) * d,
  e,
  cov: e.map((_, i) => e.map((__, j) => (i === j ? 1e-14 : 0))),
  sigma_s: 0,
  f_stat: 0,
  windows: 0,
});

describe('tracked clock rate: the spline', () => {
  it('the hat integrals sum to the time since the first knot (the hats sum to 1, held flat beyond the ends)', () => {
    const knots = [10, 30, 50, 70];
    fc.assert(
      fc.property(fc.double({ min: -50, max: 150, noNaN: true }), (t) => {
        const sum = knots.reduce((s, _, j) => s + hatIntegral(knots, j, t), 0);
        expect(sum).toBeCloseTo(t - 10, 9);
      }),
    );
  });

  it('E summed from whole hats and the few around t equals the sum over every hat (any knots, any t)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -2e-5, max: 2e-5, noNaN: true }), { minLength: 2, maxLength: 40 }),
        fc.double({ min: 60, max: 7200, noNaN: true }),
        fc.double({ min: -3, max: 45, noNaN: true }),
        (e, d, at) => {
          const tr = track(e, d);
          const t = 50 + at * d;
          const every = e.reduce((s, ej, j) => s + ej * hatIntegral(tr.knots_s, j, t), 0);
          expect(Math.abs(excursionIntegral(tr, t) - every)).toBeLessThanOrEqual(1e-12 * (1 + Math.abs(every)));
        },
      ),
    );
  });

  it('E is the integral of e (midpoints of the pieces between knots), and trackedSeconds removes it from x/k0', () => {
    const tr = track([3e-6, -5e-6, 8e-6, 1e-6]);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 450, noNaN: true }), (t) => {
        // e is linear between knots (and flat beyond them), so the midpoint rule on each piece is exact; a fixed
        // grid is not (a knot inside a cell leaves up to |Δslope|·h²/4), which once failed a 5e-11 tolerance.
        const cuts = [...new Set([50, ...tr.knots_s.filter((k) => k > Math.min(50, t) && k < Math.max(50, t)), t])].sort((a, b) => a - b);
        let s = 0;
        for (let i = 1; i < cuts.length; i++) s += rateExcursion(tr, (cuts[i - 1]! + cuts[i]!) / 2) * (cuts[i]! - cuts[i - 1]!);
        expect(excursionIntegral(tr, t) * 1e6).toBeCloseTo((t >= 50 ? s : -s) * 1e6, 9);
      }),
    );
    expect(trackedSeconds(tr, 50, 200)).toBeCloseTo(200 - excursionIntegral(tr, 250), 12);
    // The mean over a knot interval of a linear piece is the mean of its ends.
    expect(meanExcursion(tr, 150, 250).e).toBeCloseTo(1.5e-6, 15);
  });
});

describe('tracked clock rate: against the rate that made the heartbeats', () => {
  // A resonator at 10 ppm/K in an 8-hour ±2 K cycle (docs/references.md#ref-clock-sources): e(t) = 20 ppm·sin ωt.
  const w = (2 * Math.PI) / (8 * 3600);
  const A = 20e-6;
  const E = (t: number): number => (A * (1 - Math.cos(w * t))) / w;

  it('follows a ±20 ppm 8-hour swing within 0.5 ppm everywhere and within 3u at the knots, over 4 seeds', () => {
    for (let seed = 1; seed <= 4; seed++) {
      const rng = new TestRng(seed);
      const ppm = (rng.uniform() - 0.5) * 6000;
      const b = [beats(ppm, 8 * 3600, rng, E)];
      const c = clockRateFromHost(b)!;
      const tr = trackClockRate(b, c.ppm)!;
      expect(tr).not.toBeNull();
      const got = (t: number): number => tr.k0 * (1 + rateExcursion(tr, t)) - (1 + ppm * 1e-6) * (1 + A * Math.sin(w * t));
      for (let t = 300; t < 8 * 3600 - 300; t += 120) expect(Math.abs(got(t))).toBeLessThan(0.5e-6);
      let inside = 0;
      tr.knots_s.forEach((t, j) => {
        if (t > 8 * 3600) return;
        if (Math.abs(got(t)) < 3 * Math.sqrt(tr.cov[j]![j]!)) inside++;
      });
      expect(inside).toBeGreaterThanOrEqual(tr.knots_s.length - 3);
    }
  });

  it('its slope against the temperature is the clock’s coefficient (10 ppm/K within 0.01 ppm/K and 3u)', () => {
    const rng = new TestRng(11);
    const b = [beats(300, 8 * 3600, rng, E)];
    const tr = trackClockRate(b, clockRateFromHost(b)!.ppm)!;
    const ts: number[] = [];
    const dT: number[] = [];
    for (let t = 60; t < 8 * 3600; t += 10) ts.push(t), dT.push(2 * Math.sin(w * t));
    const s = temperatureSlope(tr, ts, dT)!;
    // The track is about k0, so the slope is of e; (1 + ppm)·10 ppm/K to first order.
    expect(Math.abs(s.s * tr.k0 * 1e6 - 10 * 1.0003)).toBeLessThan(Math.max(0.01, 3 * s.u * 1e6));
    expect(s.u * 1e6).toBeLessThan(0.01);
  });

  it('a constant rate is not tracked (the F test keeps the one rate), over 10 seeds', () => {
    for (let seed = 20; seed < 30; seed++) {
      const rng = new TestRng(seed);
      const ppm = (rng.uniform() - 0.5) * 6000;
      const b = [beats(ppm, 4 * 3600, rng)];
      expect(trackClockRate(b, clockRateFromHost(b)!.ppm)).toBeNull();
    }
  });

  it('a run shorter than two knot intervals is not tracked', () => {
    const rng = new TestRng(3);
    const b = [beats(100, 1000, rng, E)];
    expect(trackClockRate(b, 100)).toBeNull();
  });
});
