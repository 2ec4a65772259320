// The spherical pendulum's exactness: its invariants, the Foucault and Airy rates, planar swings along an axis.
import { describe, expect, it } from 'vitest';
import { sphereEvents, type SphereEvent } from '../../sim/spherical.ts';
import { angularMomentumZ, energy, project, SphericalSeries, type SphericalOde, type State6 } from '../../sim/spherical-taylor.ts';
import { EARTH_RATE_RAD_S } from '../../sim/plane-run.ts';

const L = 1;
const g = 9.80665;
const w0 = Math.sqrt(g / L);
const rad = Math.PI / 180;

function release(thetaDeg: number, azDeg: number, transverse = 0): State6 {
  const th = thetaDeg * rad;
  const az = azDeg * rad;
  return [L * Math.sin(th) * Math.cos(az), L * Math.sin(th) * Math.sin(az), -L * Math.cos(th), -transverse * Math.sin(az), transverse * Math.cos(az), 0];
}

/** Steps the integrator by hand (the same steps sphereEvents takes), returning the state at every step. */
function states(ode: SphericalOde, start: State6, tEnd: number): State6[] {
  const S = new SphericalSeries(ode);
  const out: State6[] = [start];
  let s = start;
  for (let t = 0; t < tEnd; ) {
    S.expand(s);
    const h = Math.min(S.stepSize(w0), (2 * Math.PI) / w0 / 16);
    s = project(S.at(h), L);
    t += h;
    out.push(s);
  }
  return out;
}

function closest(ode: SphericalOde, start: State6, tEnd: number): (SphereEvent & { kind: 'closest' })[] {
  return [...sphereEvents({ ode, omega0: w0, start, beams: [] }, tEnd)].filter((e): e is SphereEvent & { kind: 'closest' } => e.kind === 'closest');
}

/** Unweighted least-squares slope of the axis direction (velocity direction folded to a half turn), rad/s. */
function axisRate(ev: { t: number; azimuth: number }[]): number {
  const ys: number[] = [];
  for (const e of ev) {
    let a = e.azimuth;
    const prev = ys.length ? ys[ys.length - 1]! : a;
    while (a - prev > Math.PI / 2) a -= Math.PI;
    while (a - prev < -Math.PI / 2) a += Math.PI;
    ys.push(a);
  }
  const n = ev.length;
  const mt = ev.reduce((s, e) => s + e.t, 0) / n;
  const my = ys.reduce((s, y) => s + y, 0) / n;
  let sxy = 0;
  let sxx = 0;
  ev.forEach((e, i) => {
    sxy += (e.t - mt) * (ys[i]! - my);
    sxx += (e.t - mt) ** 2;
  });
  return sxy / sxx;
}

describe('spherical pendulum invariants (exact: no damping)', () => {
  it('keeps the energy and the inertial vertical angular momentum on an isotropic support in a turning room', () => {
    // Amplified room rotation so the Coriolis and centrifugal terms are far above rounding.
    const ode: SphericalOde = { L, g, kappa: 0, ux: 1, uy: 0, W: 0.01, b1: 0 };
    const s = states(ode, release(30, 20, 0.3), 120);
    const E0 = energy(ode, s[0]!);
    const L0 = angularMomentumZ(ode, s[0]!);
    const scaleE = g * L;
    const scaleL = L * L * w0;
    for (const x of s) {
      expect(Math.abs(energy(ode, x) - E0) / scaleE).toBeLessThan(1e-12);
      expect(Math.abs(angularMomentumZ(ode, x) - L0) / scaleL).toBeLessThan(1e-12);
    }
    expect(s.length).toBeGreaterThan(1000);
  });

  it('keeps the energy on an anisotropic support', () => {
    const ode: SphericalOde = { L, g, kappa: 0.02 * w0 * w0, ux: Math.cos(1), uy: Math.sin(1), W: 0, b1: 0 };
    const s = states(ode, release(40, 0, 0.5), 120);
    const E0 = energy(ode, s[0]!);
    for (const x of s) expect(Math.abs(energy(ode, x) - E0) / (g * L)).toBeLessThan(1e-12);
  });
});

describe('spherical pendulum rates', () => {
  it('turns the plane at the Foucault rate on an isotropic support (docs/references.md#ref-swing-plane)', () => {
    const W = EARTH_RATE_RAD_S * Math.sin(50 * rad);
    const ode: SphericalOde = { L, g, kappa: 0, ux: 1, uy: 0, W, b1: 0 };
    const a = L * Math.sin(3 * rad);
    const rate = axisRate(closest(ode, release(3, 0), 1200));
    // −Ω sin φ, less the Airy term of the inertial ellipse a release from rest in the room implies.
    const expected = -W * (1 - (3 * a * a) / (8 * L * L));
    expect(Math.abs(rate / expected - 1)).toBeLessThan(2e-4);
    // Clockwise in the north: −11.52 °/h at 50°.
    expect((rate * 3600) / rad).toBeCloseTo(-11.52, 1);
  });

  it('precesses an ellipse at the Airy rate 3abω/(8L²) in the sense the bob goes round (docs/references.md#ref-swing-plane)', () => {
    const ode: SphericalOde = { L, g, kappa: 0, ux: 1, uy: 0, W: 0, b1: 0 };
    for (const [deg, bOverA] of [
      [4, 0.05],
      [4, -0.1],
      [8, 0.05],
    ] as const) {
      const a = L * Math.sin(deg * rad);
      const ev = closest(ode, release(deg, 0, bOverA * a * w0), 300);
      const b = ev.reduce((s, e) => s + e.minor, 0) / ev.length;
      const airy = (3 * a * b * w0) / (8 * L * L);
      // The formula is the leading term in a/L and b/a: allow 3 % at 8°.
      expect(Math.abs(axisRate(ev) / airy - 1)).toBeLessThan(0.03);
      expect(Math.sign(b)).toBe(Math.sign(bOverA));
    }
  });

  it('keeps a swing released along a principal axis of an anisotropic support in its plane', () => {
    for (const axisDeg of [0, 30, 90]) {
      const ax = axisDeg * rad;
      const ode: SphericalOde = { L, g, kappa: 0.001 * w0 * w0, ux: Math.cos(ax), uy: Math.sin(ax), W: 0, b1: 0.001 };
      for (const along of [axisDeg, axisDeg + 90]) {
        const ev = closest(ode, release(20, along), 200);
        for (const e of ev) {
          expect(Math.abs(e.minor)).toBeLessThan(1e-12);
          expect(Math.abs(Math.sin(e.azimuth - along * rad))).toBeLessThan(1e-12);
        }
      }
    }
  });

  it('rocks the axis about the soft axis, not round, when the support is anisotropic', () => {
    // Stiff axis at 90°: a swing released 12° off the soft axis (x) keeps returning toward it.
    const ode: SphericalOde = { L, g, kappa: 0.002 * w0 * w0, ux: 0, uy: 1, W: 0, b1: 0 };
    const ev = closest(ode, release(5, 12), 1200);
    const axes = ev.map((e) => Math.atan(Math.tan(e.azimuth)) / rad);
    expect(Math.max(...axes)).toBeLessThan(13);
    expect(Math.min(...axes)).toBeGreaterThan(-13);
    expect(Math.min(...axes)).toBeLessThan(-8);
  });
});

describe('two beams, two channels', () => {
  it('puts each beam on its own channel: every closest approach gives one blocked interval per beam', async () => {
    const { loadScenario, simulateEntries } = await import('../../sim/index.ts');
    const { entries, truth } = simulateEntries(loadScenario('plane-foucault-50n'), { seed: 3, durationS: 60 });
    const edges: Record<string, number> = { '0': 0, '1': 0 };
    for (const e of entries) {
      const m = e.kind === 'data' ? /^E [0-9a-f]+ ([01]) f /.exec(e.line) : null;
      if (m) edges[m[1]!]!++;
    }
    const passes = truth.plane!.t_s.length;
    // Blocked reads low: one falling edge per pass per beam (the last pass may be cut by the run's end).
    for (const ch of ['0', '1']) expect(Math.abs(edges[ch]! - passes)).toBeLessThanOrEqual(1);
    expect(passes).toBeGreaterThan(20);
  });
});
