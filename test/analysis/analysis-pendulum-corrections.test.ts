import { describe, expect, it } from 'vitest';
import { airPeriodRel, dampingPeriodRel, effectiveLength, pendulumModel } from '../../host/analysis/pendulum-corrections.ts';
import { parseSimpleRig } from '../../protocol/rig.ts';

// docs/references.md#ref-pendulum-corrections: the example pendulum L = 1.000 m, r = 12.7 mm, 0.5 g string, steel 7850 kg/m³ (M = 67.35 g)
// or brass 8500 kg/m³ (M = 72.93 g), air 1.204 kg/m³, η = 1.81e-5 Pa·s, ω0 = 3.1316 rad/s. Forms after
// Nelson & Olsson, Am. J. Phys. 54, 112 (1986) (finite bob r²/5L², string −(1/12)(m_s/M)); exact forms derived there.
const L = 1;
const r = 0.0127;
const period = (Leff: number): number => Math.sqrt(Leff);

describe('corrections from the simple pendulum (relative period changes ε = ΔT/T0)', () => {
  it('finite sphere: √(1 + 2r²/5L²) − 1 = 3.2257e-5 (≈ r²/5L²)', () => {
    expect(period(effectiveLength(L, r, 1, 0)) / period(L) - 1).toBeCloseTo(3.2257e-5, 9);
  });

  it('string as a uniform rod: −6.2426e-4 for steel (first order −(m_s/12M)(1 + r/L) = −6.2647e-4), −5.7667e-4 for brass', () => {
    const sphere = effectiveLength(L, r, 0.06735, 0);
    expect(period(effectiveLength(L, r, 0.06735, 0.0005)) / period(sphere) - 1).toBeCloseTo(-6.2426e-4, 7);
    const sphereB = effectiveLength(L, r, 0.07293, 0);
    expect(period(effectiveLength(L, r, 0.07293, 0.0005)) / period(sphereB) - 1).toBeCloseTo(-5.7667e-4, 7);
  });

  it('air, buoyancy + added mass with the Stokes term (k = 1.049): 1.5714e-4 steel, 1.4512e-4 brass', () => {
    expect(airPeriodRel(1.204, 7850, r, 3.1316)).toBeCloseTo(1.5714e-4, 8);
    expect(airPeriodRel(1.204, 8500, r, 3.1316)).toBeCloseTo(1.4512e-4, 8);
  });

  it('air with ideal-flow added mass (k = 1/2): buoyancy 7.669e-5 + added mass 3.834e-5 for steel, to first order', () => {
    expect(airPeriodRel(1.204, 7850, r, 3.1316, 0.5)).toBeCloseTo(7.669e-5 + 3.834e-5, 7);
  });

  it('damping: ODE zero-crossing spacing ratio 1.0000500038 at Q = 50 (docs/references.md#ref-pendulum-corrections)', () => {
    expect(dampingPeriodRel(50)).toBeCloseTo(5.00038e-5, 10);
  });

  it('the rig model applies what its inputs allow and lists the rest', () => {
    const rig = parseSimpleRig({ length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254, bob_mass_kg: 0.06735, string_mass_kg: 0.0005, bob_density_kg_m3: 7850, air_density_kg_m3: 1.204 });
    if (!rig.ok) throw new Error(rig.error);
    const m = pendulumModel(rig.rig, 3.1316, 2000);
    expect(m.lines.every((l) => l.applied)).toBe(true);
    // Applied: the middle of potential flow (k = 1/2) and Stokes (k = 1.049); the half-range is its uncertainty.
    const lo = airPeriodRel(1.204, 7850, r, 3.1316, 0.5);
    expect(m.air_rel).toBeCloseTo((lo + 1.5714e-4) / 2, 8);
    expect(m.lines.find((l) => l.name.startsWith('air'))!.u_rel!).toBeGreaterThan((1.5714e-4 - lo) / 2 / Math.sqrt(3));
    expect(m.L_eff_m).toBeCloseTo(effectiveLength(1, r, 0.06735, 0.0005), 15);
    const bare = parseSimpleRig({ length_m: 1, flag_width_m: 0.0254 });
    if (!bare.ok) throw new Error(bare.error);
    const b = pendulumModel(bare.rig, 3.1316, null);
    expect(b.L_eff_m).toBe(1);
    expect(b.lines.filter((l) => l.applied)).toEqual([]);
    expect(b.unapplied_rel).toBeGreaterThan(1e-4);
  });
});
