// The swing plane over a run: the azimuth's rate, the Foucault and Airy rates (coverage over seeds: *-coverage).
import { describe, expect, it } from 'vitest';
import { planePasses } from '../../host/analysis/plane-passes.ts';
import { azimuthRate, foucaultRate, summarizePlane, unwrapAxis } from '../../host/analysis/plane-rate.ts';
import { planeRates, planeRun } from './plane-fixtures.ts';

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

  it('widens the interval when the axis rocks (anisotropic support): residuals are correlated, not white', () => {
    const { m, truth } = planeRates('plane-anisotropic-push', 1, 900);
    expect(Math.abs(m.rate - truth)).toBeLessThan(2 * m.u);
    const r = planeRates('plane-foucault-50n', 1, 900).m;
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
