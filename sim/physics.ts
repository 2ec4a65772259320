// The true physical pendulum of a scenario: ω0 from the moment of inertia, damping terms, and the beam zone.
import type { Scenario } from './scenario.ts';
import type { SwingSetup } from './swing.ts';

/** The true parameters a scenario's physics implies (also written to the truth file). */
export interface TruePhysics {
  readonly g_m_s2: number;
  readonly length_m: number;
  readonly bob_radius_m: number;
  /** Small-amplitude period of the modelled system, from I and the gravity torque. */
  readonly T0_s: number;
  /** 2π√(L/g): the ideal point-mass period, for comparison. */
  readonly T0_point_s: number;
  readonly omega0: number;
  /** Moment of inertia about the pivot and gravity torque per unit sin θ, per kg of bob (the string and air included). */
  readonly inertia_per_kg: number;
  readonly torque_per_kg: number;
  readonly release_rad: number;
  /** θ'' = −ω0² sin θ − b1 θ' − b2 |θ'|θ' − b0 sgn θ'. */
  readonly b1_per_s: number;
  readonly b2_per_rad: number;
  readonly b0_rad_per_s2: number;
  /** Small-amplitude Q of the linear term alone (Infinity when there is none). */
  readonly linear_q: number;
  /** The bob blocks the beam while θ is in this open interval (rad). */
  readonly zone_rad: readonly [number, number];
  readonly gate_offset_m: number;
  readonly model: string;
}

/**
 * Moment of inertia and torque. The bob is a uniform sphere of radius r (I = M(L² + 2r²/5)), or a point when
 * the rig has no bob_diameter_m. A string mass is a uniform rigid rod from the pivot to the top of the bob
 * (length L − r: I = m_s l²/3, centre of mass at l/2). With a bob density, air gives buoyancy (torque
 * ∝ M − m_air) and an added mass k·m_air that moves with the bob's centre.
 */
export function truePhysics(s: Scenario): TruePhysics {
  if (s.rigid) return rigidPhysics(s);
  const { rig, physics, gate } = s;
  const L = physics.length_m ?? rig.length_m;
  const r = rig.bob_diameter_m !== undefined ? rig.bob_diameter_m / 2 : 0;
  const M = rig.bob_mass_kg ?? 1;
  const ms = rig.bob_mass_kg !== undefined ? (rig.string_mass_kg ?? 0) : 0;
  const l = L - r;
  const mAir = rig.bob_density_kg_m3 !== undefined ? (rig.air_density_kg_m3 * M) / rig.bob_density_kg_m3 : 0;
  const I = M * (L * L + (2 * r * r) / 5) + physics.added_mass_k * mAir * L * L + (ms * l * l) / 3;
  const torque = physics.g_m_s2 * ((M - mAir) * L + (ms * l) / 2);
  const omega0 = Math.sqrt(torque / I);
  const q = physics.linear_q;
  const parts = [r > 0 ? 'sphere bob' : 'point bob', ms > 0 ? 'string as uniform rod' : 'massless string', mAir > 0 ? `air buoyancy + added mass k=${physics.added_mass_k}` : 'no air'];
  return {
    g_m_s2: physics.g_m_s2,
    length_m: L,
    bob_radius_m: r,
    T0_s: (2 * Math.PI) / omega0,
    T0_point_s: 2 * Math.PI * Math.sqrt(L / physics.g_m_s2),
    omega0,
    inertia_per_kg: I / M,
    torque_per_kg: torque / M,
    release_rad: (physics.release_deg * Math.PI) / 180,
    b1_per_s: q !== undefined ? omega0 / q : 0,
    b2_per_rad: physics.quadratic_per_rad ?? 0,
    b0_rad_per_s2: (physics.coulomb_rad ?? 0) * omega0 * omega0,
    linear_q: q ?? Infinity,
    zone_rad: beamZone(s, L),
    gate_offset_m: gate.offset_m,
    model: parts.join(', '),
  };
}

/** The bob blocks the beam between these angles: the flag's edges at radius R from the pivot. */
function beamZone(s: Scenario, R: number): readonly [number, number] {
  const half = s.rig.flag_width_m / 2;
  return [Math.asin(clamp((s.gate.offset_m - half) / R)), Math.asin(clamp((s.gate.offset_m + half) / R))];
}

/**
 * A rigid body on a knife edge: ω0² = g h/(k² + h²) with h the true pivot-to-centre-of-mass distance and k the
 * radius of gyration about the centre of mass; the beam crosses the flag at the rig's flag_radius_m. No air: for a
 * body of one outer shape it acts alike about both edges (docs/references.md#ref-reversible-pendulum).
 */
function rigidPhysics(s: Scenario): TruePhysics {
  const { physics, gate } = s;
  const h = physics.cm_distance_m!;
  const k2 = physics.gyration_radius_m! ** 2;
  const omega0 = Math.sqrt((physics.g_m_s2 * h) / (k2 + h * h));
  const q = physics.linear_q;
  return {
    g_m_s2: physics.g_m_s2,
    length_m: h + k2 / h,
    bob_radius_m: 0,
    T0_s: (2 * Math.PI) / omega0,
    T0_point_s: 2 * Math.PI * Math.sqrt(h / physics.g_m_s2),
    omega0,
    inertia_per_kg: k2 + h * h,
    torque_per_kg: physics.g_m_s2 * h,
    release_rad: (physics.release_deg * Math.PI) / 180,
    b1_per_s: q !== undefined ? omega0 / q : 0,
    b2_per_rad: physics.quadratic_per_rad ?? 0,
    b0_rad_per_s2: (physics.coulomb_rad ?? 0) * omega0 * omega0,
    linear_q: q ?? Infinity,
    zone_rad: beamZone(s, s.rigid!.flag_radius_m),
    gate_offset_m: gate.offset_m,
    model: `rigid body on a knife edge (h = ${h} m, k = ${physics.gyration_radius_m} m), no air`,
  };
}

function clamp(x: number): number {
  return Math.max(-1, Math.min(1, x));
}

/** The integrator's view of the physics. */
export function swingSetup(p: TruePhysics): SwingSetup {
  return {
    ode: { w2: p.omega0 * p.omega0, b1: p.b1_per_s, b2: p.b2_per_rad, b0: p.b0_rad_per_s2 },
    omega0: p.omega0,
    theta0: p.release_rad,
    zone: p.zone_rad,
  };
}
