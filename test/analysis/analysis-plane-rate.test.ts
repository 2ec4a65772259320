// The swing plane over a run: the azimuth's rate and its k = 2 coverage over seeds, the Foucault and Airy rates.
import { describe, expect, it } from 'vitest';
import { planePasses } from '../../host/analysis/plane-passes.ts';
import { azimuthRate, foucaultRate, summarizePlane, unwrapAxis } from '../../host/analysis/plane-rate.ts';
import { foldAxis } from '../../host/analysis/two-beam-geometry.ts';
import { planeRun } from './plane-fixtures.ts';

const rad = Math.PI / 180;

/** The run's measured rate, and the same least-squares slope of the simulator's exact azimuths at the same passes. */
function rates(name: string, seed: number, dur: number): { m: { rate: number; u: number }; truth: number } {
  const run = planeRun(name, seed, dur);
  const ps = planePasses(run.A, run.B, run.geometry, run.periodGuess).passes.filter((p) => !p.flag);
  const tr = run.truth.plane!;
  const times = tr.t_s.map(run.deviceTime);
  let j = 0;
  const trueAz = ps.map((p) => {
    while (j + 1 < times.length && Math.abs(times[j + 1]! - p.t) < Math.abs(times[j]! - p.t)) j++;
    return foldAxis(tr.azimuth_deg[j]! * rad, { ...run.geometry, omega0: 1 });
  });
  const t = ps.map((p) => p.t);
  return {
    m: azimuthRate(
      t,
      ps.map((p) => p.azimuth),
    )!,
    truth: azimuthRate(t, trueAz)!.rate,
  };
}

describe('azimuth rate', () => {
  it('unwraps an axis by half turns and fits a known slope exactly', () => {
    const t = Array.from({ length: 50 }, (_, i) => i);
    const az = t.map((x) => ((0.03 * x + Math.PI / 2) % Math.PI) - Math.PI / 2);
    const r = azimuthRate(t, az)!;
    expect(r.rate).toBeCloseTo(0.03, 12);
    expect(unwrapAxis([1.5, -1.6])[1]).toBeCloseTo(Math.PI - 1.6, 12);
  });

  it('Foucault rate: −15.041°/h·sin(latitude), clockwise in the north (docs/references.md#ref-swing-plane)', () => {
    expect(foucaultRate(50)).toBeCloseTo(-11.522, 3);
    expect(foucaultRate(-30)).toBeCloseTo(7.5205, 3);
  });

  it('k = 2 interval holds the true rate in 93–97 % of seeds (two noise-limited scenarios, 150 seeds each, 5 min runs)', () => {
    let inside = 0;
    let n = 0;
    for (const name of ['plane-foucault-50n', 'plane-clock-1500ppm']) {
      for (let seed = 1; seed <= 150; seed++) {
        const { m, truth } = rates(name, seed, 300);
        if (Math.abs(m.rate - truth) <= 2 * m.u) inside++;
        n++;
      }
    }
    expect(inside / n).toBeGreaterThanOrEqual(0.93);
    expect(inside / n).toBeLessThanOrEqual(0.97);
  }, 120_000);

  it('widens the interval when the axis rocks (anisotropic support): residuals are correlated, not white', () => {
    const { m, truth } = rates('plane-anisotropic-push', 1, 900);
    expect(Math.abs(m.rate - truth)).toBeLessThan(2 * m.u);
    const r = rates('plane-foucault-50n', 1, 900).m;
    expect(m.u).toBeGreaterThan(50 * r.u);
  });
});

describe('plane summary against the simulator', () => {
  it('reads the Foucault rate on the isotropic support at 50° N, and an Airy rate that matches the turning of a pushed ellipse', () => {
    const f = planeRun('plane-foucault-50n', 1, 1800);
    const omega0 = (2 * Math.PI) / f.truth.physics.T0_s;
    const s = summarizePlane(planePasses(f.A, f.B, f.geometry, f.periodGuess).passes, { lengthM: f.geometry.length, omega0, latitudeDeg: 50 })!;
    expect(s.foucault_deg_per_h).toBeCloseTo(-11.522, 3);
    // Released from rest in the room: the measured rate is Foucault's less Airy's 3a²/(8L²) share (< 0.5 % here).
    expect(Math.abs(s.precession_deg_per_h - s.foucault_deg_per_h!)).toBeLessThan(0.006 * 11.522);
    expect(s.minor_axis_max_m).toBeLessThan(5e-5);

    const p = planeRun('plane-turns-40deg', 1, 1800);
    const sp = summarizePlane(planePasses(p.A, p.B, p.geometry, p.periodGuess).passes, { lengthM: p.geometry.length, omega0: (2 * Math.PI) / p.truth.physics.T0_s })!;
    expect(sp.foucault_deg_per_h).toBeNull();
    // No Earth: the whole turning is Airy's (leading order in a/L: a few per cent at 12°).
    expect(Math.abs(sp.precession_deg_per_h / sp.airy_deg_per_h - 1)).toBeLessThan(0.05);
    expect(sp.airy_deg_per_h).toBeGreaterThan(20);
  });
});
