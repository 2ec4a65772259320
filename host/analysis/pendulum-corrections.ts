// Corrections from the ideal simple pendulum to a real one, as relative period changes ε = ΔT/T0 (δg/g = −2ε).
// Forms after R. A. Nelson and M. G. Olsson, "The pendulum — Rich physics from a simple system", Am. J. Phys. 54,
// 112 (1986): finite bob r²/(5L²) (we use the exact √(1 + 2r²/5L²) − 1 from I = M(L² + 2r²/5)), string mass
// −(1/12)(m_s/M) (we use the exact rigid-rod form below), air buoyancy and added mass,
// and damping (docs/references.md#ref-pendulum-corrections).
import type { Rig } from '../../protocol/rig.ts';
import type { CorrectionLine } from './result.ts';

/** Kinematic viscosity inputs for the Stokes added-mass term: dynamic viscosity of air at 20 °C (from memory). */
const AIR_VISCOSITY_PA_S = 1.81e-5;
/** Steel, the common bob material, for sizing the air correction when no density is given (common practice). */
const TYPICAL_BOB_DENSITY = 7850;

/** The effective length I/(M_total·h) and the corrections considered. */
export interface PendulumModel {
  /** Length of the equivalent simple pendulum, m. */
  readonly L_eff_m: number;
  /** Relative period change from air (buoyancy + added mass) that was applied (0 when not). */
  readonly air_rel: number;
  /** Relative half-width of the corrections not applied, for the budget. */
  readonly unapplied_rel: number;
  readonly lines: CorrectionLine[];
}

/**
 * Effective length of a rigid pendulum: bob (sphere of radius r, mass M, centre at L) on a string modelled as a
 * uniform rod of length L − r and mass m_s: L_eff = (M(L² + 2r²/5) + m_s l²/3)/(M·L + m_s·l/2).
 */
export function effectiveLength(L: number, r: number, bobMass: number, stringMass: number): number {
  const l = L - r;
  const inertia = bobMass * (L * L + 0.4 * r * r) + (stringMass * l * l) / 3;
  return inertia / (bobMass * L + 0.5 * stringMass * l);
}

/**
 * Air: T = T_vac·√((M + k·m_a)/(M − m_a)), m_a/M = ρ_air/ρ_bob; buoyancy lowers the restoring torque, added mass
 * (k = 1/2 for potential flow about a sphere, plus the Stokes boundary-layer term 9δ/(4r), δ = √(2ν/ω0); Stokes
 * 1851, from memory) raises the inertia.
 */
export function airPeriodRel(rhoAir: number, rhoBob: number, radius: number | undefined, omega0: number, addedMassK?: number): number {
  const ratio = rhoAir / rhoBob;
  const k = addedMassK ?? stokesAddedMassK(rhoAir, radius, omega0);
  return Math.sqrt((1 + k * ratio) / (1 - ratio)) - 1;
}

/** Added-mass coefficient of a sphere oscillating in air: 1/2 + 9δ/(4r), δ = √(2ν/ω0) (1/2 without a radius). */
export function stokesAddedMassK(rhoAir: number, radius: number | undefined, omega0: number): number {
  if (radius === undefined || !(rhoAir > 0)) return 0.5;
  const delta = Math.sqrt((2 * (AIR_VISCOSITY_PA_S / rhoAir)) / omega0);
  return 0.5 + (9 * delta) / (4 * radius);
}

/** Linear damping lengthens the period by 1/√(1 − 1/(4Q²)) − 1 ≈ 1/(8Q²). */
export function dampingPeriodRel(q: number): number {
  return 1 / Math.sqrt(1 - 1 / (4 * q * q)) - 1;
}

/** Builds the model of a rig: what is applied, what is only listed. */
export function pendulumModel(rig: Rig, omega0: number, q: number | null): PendulumModel {
  const lines: CorrectionLine[] = [];
  const L = rig.length_m;
  const r = rig.bob_diameter_m !== undefined ? rig.bob_diameter_m / 2 : undefined;
  const haveMasses = rig.bob_mass_kg !== undefined && rig.string_mass_kg !== undefined;
  const sphereOnly = r !== undefined ? effectiveLength(L, r, 1, 0) : L;
  const full = r !== undefined && haveMasses ? effectiveLength(L, r, rig.bob_mass_kg!, rig.string_mass_kg!) : haveMasses ? effectiveLength(L, 0, rig.bob_mass_kg!, rig.string_mass_kg!) : sphereOnly;
  lines.push({
    id: 'finite-bob',
    name: 'finite bob (sphere, I = M(L² + 2r²/5))',
    period_rel: Math.sqrt(sphereOnly / L) - 1,
    applied: r !== undefined,
    why: r !== undefined ? { kind: 'bob-radius', m: r } : { kind: 'not-applied', correction: 'finite-bob' },
  });
  lines.push({
    id: 'string-mass',
    name: 'string mass (uniform rod to the bob)',
    period_rel: Math.sqrt(full / sphereOnly) - 1,
    applied: haveMasses,
    why: haveMasses ? { kind: 'string-to-bob-mass', ratio: rig.string_mass_kg! / rig.bob_mass_kg! } : { kind: 'not-applied', correction: 'string-mass' },
  });
  const haveDensity = rig.bob_density_kg_m3 !== undefined;
  // The added-mass coefficient of a real swing lies between potential flow (k = 1/2) and Stokes' oscillating
  // sphere (k ≈ 1.05 for a 25 mm ball at 0.5 Hz; its amplitude ≫ r and the wake are neither): we apply the middle
  // and count the half-range as a rectangular uncertainty.
  const rhoB = rig.bob_density_kg_m3 ?? TYPICAL_BOB_DENSITY;
  const airLo = airPeriodRel(rig.air_density_kg_m3, rhoB, r, omega0, 0.5);
  const airHi = airPeriodRel(rig.air_density_kg_m3, rhoB, r, omega0);
  const air = 0.5 * (airLo + airHi);
  lines.push({
    id: 'air',
    name: 'air buoyancy and added mass',
    period_rel: air,
    u_rel: haveDensity ? Math.hypot(0.1 * airLo, (airHi - airLo) / 2 / Math.sqrt(3)) : Math.abs(air) / Math.sqrt(3),
    applied: haveDensity,
    why: haveDensity ? { kind: 'air-to-bob-density', ratio: rig.air_density_kg_m3 / rig.bob_density_kg_m3! } : { kind: 'not-applied', correction: 'air' },
  });
  const damp = q !== null && q > 0.5 ? dampingPeriodRel(q) : 0;
  lines.push({
    id: 'damping',
    name: 'damping (viscous form 1/(8Q²))',
    period_rel: damp,
    applied: q !== null,
    why: q !== null ? { kind: 'q-measured', q } : { kind: 'not-applied', correction: 'damping' },
  });
  return { L_eff_m: full, air_rel: haveDensity ? air : 0, unapplied_rel: haveDensity ? 0 : air, lines };
}
