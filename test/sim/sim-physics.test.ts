// The simulated pendulum's physics against the reference sheet: damping laws, gate offset, sphere, string, air.
import { describe, expect, it } from 'vitest';
import { bobEvents, type BobEvent } from '../../sim/swing.ts';
import { truePhysics } from '../../sim/physics.ts';
import { parseScenario } from '../../sim/scenario.ts';

// L = 1 m, g = 9.80665 m/s², θ0 = 5°: the ODE check conditions of docs/references.md#ref-damping and docs/references.md#ref-gate-offset.
const w = Math.sqrt(9.80665);
const th0 = (5 * Math.PI) / 180;

function events(ode: Partial<{ b1: number; b2: number; b0: number }>, tEnd: number, zone: readonly [number, number] = [-0.0127, 0.0127]): BobEvent[] {
  return [...bobEvents({ ode: { w2: w * w, b1: 0, b2: 0, b0: 0, ...ode }, omega0: w, theta0: th0, zone }, tEnd)];
}
const turns = (ev: BobEvent[]) => ev.filter((e) => e.kind === 'turn').map((e) => Math.abs((e as { theta: number }).theta));

describe('damping laws (docs/references.md#ref-damping: derived; ODE check values)', () => {
  it('linear, Q = 2000: ln(A_n/A_n+1) per cycle = 1.5722e-3 (π/Q = 1.5708e-3)', () => {
    const a = turns(events({ b1: w / 2000 }, 30));
    expect(Math.log(a[0]! / a[2]!)).toBeCloseTo(1.5722e-3, 7);
    expect(Math.abs(Math.log(a[0]! / a[2]!) - Math.PI / 2000)).toBeLessThan(2e-6);
  });

  it('quadratic, cL/M = 0.01: Δ(1/A) per cycle = 0.026680 (theory 8c/3 = 0.026667)', () => {
    const a = turns(events({ b2: 0.01 }, 30));
    expect(1 / a[2]! - 1 / a[0]!).toBeCloseTo(0.02668, 5);
  });

  it('Coulomb, θ_f = 1e-4: ΔA per cycle = 4.0051e-4 (theory 4θ_f), and the bob comes to rest', () => {
    const a = turns(events({ b0: 1e-4 * w * w }, 30));
    expect(a[0]! - a[2]!).toBeCloseTo(4.0051e-4, 8);
    const ev = events({ b0: 2e-3 * w * w }, 200);
    const rest = ev.find((e) => e.kind === 'rest') as { theta: number } | undefined;
    expect(rest).toBeDefined();
    expect(Math.abs(Math.sin(rest!.theta))).toBeLessThanOrEqual(2e-3);
  });
});

describe('gate offset (docs/references.md#ref-gate-offset, derived; ODE check values)', () => {
  it('δ = 0.5 mrad: consecutive crossings alternate 1.00734278 s and 1.00002191 s, and each pair sums to T', () => {
    const d = 0.0005;
    const ev = events({}, 12, [d - 1e-9, d + 1e-9]).filter((e) => e.kind === 'enter').map((e) => e.t);
    expect(ev[1]! - ev[0]!).toBeCloseTo(1.00734278, 7);
    expect(ev[2]! - ev[1]!).toBeCloseTo(1.00002191, 7);
    // T = T0 · 2K/π at 5° (docs/references.md#ref-period-ratio: 1.000476172485987).
    expect(Math.abs(ev[2]! - ev[0]! - ((2 * Math.PI) / w) * 1.000476172485987)).toBeLessThan(1e-12);
  });
});

describe('physical pendulum model (docs/references.md#ref-pendulum-corrections: N&O 1986 forms, exact recomputed there)', () => {
  const r = 0.0127;
  const steelM = 7850 * (4 / 3) * Math.PI * r ** 3; // steel 7850 kg/m³: common practice, no source (docs/references.md#ref-pendulum-corrections)
  const phys = (rig: Record<string, unknown>, k = 0.5) =>
    truePhysics(parseScenario({ rig: { length_m: 1, flag_width_m: 0.0254, ...rig }, duration_s: 10, physics: { g_m_s2: 9.80665, release_deg: 5, added_mass_k: k } }));
  const point = phys({});

  it('point mass: T0 = 2π√(L/g) = 2.00640929259 s (docs/references.md#ref-period-ratio)', () => {
    expect(point.T0_s).toBeCloseTo(2.00640929259, 10);
  });
  it('sphere r = 12.7 mm: ε = √(1 + 2r²/5L²) − 1 = 3.2257e-5', () => {
    expect(phys({ bob_diameter_m: 2 * r }).T0_s / point.T0_s - 1).toBeCloseTo(3.2257e-5, 9);
  });
  it('0.5 g string as a uniform rod on the steel sphere: ε = −6.2426e-4 (brass: −5.7667e-4)', () => {
    const sphere = phys({ bob_diameter_m: 2 * r });
    const steel = phys({ bob_diameter_m: 2 * r, bob_mass_kg: steelM, string_mass_kg: 0.0005 });
    expect(steel.T0_s / sphere.T0_s - 1).toBeCloseTo(-6.2426e-4, 8);
    const brass = phys({ bob_diameter_m: 2 * r, bob_mass_kg: (8500 / 7850) * steelM, string_mass_kg: 0.0005 });
    expect(brass.T0_s / sphere.T0_s - 1).toBeCloseTo(-5.7667e-4, 8);
  });
  it('air (ρ_a = 1.204) on steel, Stokes added mass k = 1.049: ε = √((M + k m_a)/(M − m_a)) − 1 = 1.5714e-4', () => {
    const air = phys({ bob_mass_kg: steelM, bob_density_kg_m3: 7850, air_density_kg_m3: 1.204 }, 1.049);
    // The sheet prints 5 significant figures.
    expect(Math.abs(air.T0_s / point.T0_s - 1 - 1.5714e-4)).toBeLessThan(1e-8);
  });
  it('the beam zone follows the offset sign: + offset moves the zone toward the release side', () => {
    const p = truePhysics(
      parseScenario({ rig: { length_m: 1, flag_width_m: 0.02 }, duration_s: 10, physics: { g_m_s2: 9.8, release_deg: 10 }, gate: { offset_m: 0.003 } }),
    );
    expect(p.zone_rad[0]).toBeCloseTo(Math.asin(-0.007), 15);
    expect(p.zone_rad[1]).toBeCloseTo(Math.asin(0.013), 15);
  });
});

describe('beam transit time through the whole simulator (docs/references.md#ref-transit-amplitude: quadrature of the exact motion)', () => {
  // L = 1 m, d = 25.4 mm beam-blocking width centred on the lowest point, g = 9.80665, no damping.
  const table: [number, number][] = [
    [1, 0.520469497],
    [2, 0.2378399751],
    [5, 0.09330858753],
    [10, 0.04657405431],
    [30, 0.01567120564],
  ];
  it.each(table)('released at %s°: every pass blocks the beam for the tabulated time, amplitude recorded with it', async (deg, dt) => {
    const { simulateJournal } = await import('../../sim/index.ts');
    const s = parseScenario({
      rig: { length_m: 1, flag_width_m: 0.0254 },
      duration_s: 20,
      physics: { g_m_s2: 9.80665, release_deg: deg },
      gate: { offset_m: 0 },
    });
    const { lines, truth } = simulateJournal(s, { seed: 1 });
    for (const _ of lines);
    expect(truth.passes.enter_s.length).toBeGreaterThanOrEqual(8);
    // The run may end during a pass: its entry has no exit yet.
    expect(truth.passes.enter_s.length - truth.passes.exit_s.length).toBeLessThanOrEqual(1);
    truth.passes.exit_s.forEach((x, i) => {
      const t = truth.passes.enter_s[i]!;
      expect(Math.abs(x - t - dt)).toBeLessThan(1e-9);
      expect(Math.abs(Math.abs(truth.passes.amplitude_rad[i]!) - (deg * Math.PI) / 180)).toBeLessThan(1e-12);
    });
  });
});
