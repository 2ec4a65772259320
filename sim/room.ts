// The room around a simulated rig: a day's temperature cycle, a pressure front and humidity, the string's
// length following the temperature, and air density (CIPM-2007) in buoyancy and added mass.
import { airDensityCipm2007 } from '../host/analysis/air-density.ts';
import type { RateExcursion } from './device-clock.ts';
import { truePhysics, type TruePhysics } from './physics.ts';
import type { Scenario } from './scenario.ts';

export interface RoomSetup {
  /** Mean temperature, °C, and the amplitude (K) and period (h) of its sinusoidal cycle (phase: mean and rising at t = 0). */
  readonly temp_mean_C: number;
  readonly temp_amp_K: number;
  readonly temp_period_h: number;
  /** Pressure far before the front (Pa), its change across the front (Pa), when (h) and over how long (h, tanh width). */
  readonly press_Pa: number;
  readonly front_Pa: number;
  readonly front_at_h: number;
  readonly front_width_h: number;
  /** Relative humidity (%): mean, and its swing against the temperature (the same air holding its water). */
  readonly rh_mean_pct: number;
  readonly rh_amp_pct: number;
  /** Linear expansion of the effective length (1/K), and the temperature at which the rig's length_m holds. */
  readonly expansion_per_K: number;
  readonly length_temp_C: number;
  /** The device's room reading interval (s). */
  readonly interval_s: number;
  /**
   * The device clock's rate against the board's temperature (ppm/K, about the cycle's mean), the board at the
   * room's temperature: a 16 MHz ceramic resonator moves about 10 ppm/K (docs/references.md#ref-clock-sources).
   */
  readonly clock_tempco_ppm_per_K: number;
}

export interface RoomConditions {
  readonly tempC: number;
  readonly pressPa: number;
  readonly rhPct: number;
}

/** The room at host time t_s (seconds since #start). */
export function roomAt(r: RoomSetup, t_s: number): RoomConditions {
  const w = (2 * Math.PI * t_s) / (r.temp_period_h * 3600);
  return {
    tempC: r.temp_mean_C + r.temp_amp_K * Math.sin(w),
    pressPa: r.press_Pa + (r.front_Pa / 2) * (1 + Math.tanh((t_s / 3600 - r.front_at_h) / r.front_width_h)),
    rhPct: r.rh_mean_pct - r.rh_amp_pct * Math.sin(w),
  };
}

/** The device clock's rate excursion in this room: tempco·(T(t) − T_mean), and its integral in closed form. */
export function clockExcursion(r: RoomSetup): RateExcursion | undefined {
  if (r.clock_tempco_ppm_per_K === 0 || r.temp_amp_K === 0) return undefined;
  const w = (2 * Math.PI) / (r.temp_period_h * 3600);
  const a = r.clock_tempco_ppm_per_K * 1e-6 * r.temp_amp_K;
  return { rate: (t) => a * Math.sin(w * t), integral: (t) => (a * (1 - Math.cos(w * t))) / w };
}

/** The scenario's true physics in these conditions: length at this temperature, air density by CIPM-2007. */
export function physicsIn(s: Scenario, r: RoomSetup, c: RoomConditions): TruePhysics {
  const length_m = s.rig.length_m * (1 + r.expansion_per_K * (c.tempC - r.length_temp_C));
  return truePhysics({ ...s, rig: { ...s.rig, length_m, air_density_kg_m3: airDensityCipm2007(c) } });
}

/** ω0² at host time t_s, for an integrator that follows the room. */
export function omega0SquaredAt(s: Scenario, r: RoomSetup): (t_s: number) => number {
  return (t_s) => physicsIn(s, r, roomAt(r, t_s)).omega0 ** 2;
}
