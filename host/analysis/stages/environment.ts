// Stage: the room beside the swing (A records): its means and range, the air density at the mean conditions
// (CIPM-2007, x_CO2 = 0.0004) and the effective length's temperature coefficient from the reduced periods.
import { airDensityCipm2007 } from '../air-density.ts';
import type { SequencedPasses } from '../passes.ts';
import type { EnvironmentResult } from '../result.ts';
import { fitLengthDrift, type RoomReading } from '../room-drift.ts';
import type { Rig } from '../../../protocol/rig.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

const mean = (xs: readonly number[]): number => xs.reduce((s, v) => s + v, 0) / xs.length;

/** null without readings; the coefficient null when the periods do not span the temperature. */
export function environmentOf(room: readonly RoomReading[] | undefined, passes: SequencedPasses, periods: Periods, reduction: Reduction, rig: Rig | null): EnvironmentResult | null {
  if (!room || room.length === 0) return null;
  const temps = room.map((r) => r.tempC);
  const conditions = { tempC: mean(temps), pressPa: mean(room.map((r) => r.pressPa)), rhPct: mean(room.map((r) => r.rhPct)) };
  const points: { t_s: number; T0_s: number; amplitude_rad: number }[] = [];
  for (let i = 0; i < periods.P.length; i++) {
    if (!reduction.keep[i] || !Number.isFinite(reduction.P0[i]!)) continue;
    points.push({ t_s: Number(passes.t[periods.ends[i]!]) - periods.P[i]! / 2, T0_s: reduction.P0[i]!, amplitude_rad: reduction.pAmp[i]! });
  }
  const sorted = [...room].sort((a, b) => a.t_s - b.t_s);
  // Only periods between the first and last readings: outside them the temperature is not known.
  const inside = points.filter((p) => p.t_s >= sorted[0]!.t_s && p.t_s <= sorted.at(-1)!.t_s);
  const spread = Math.max(...temps) - Math.min(...temps) > 0.1;
  const fit = spread ? fitLengthDrift(inside, sorted, rig?.bob_density_kg_m3 !== undefined ? { bobDensity: rig.bob_density_kg_m3 } : {}) : null;
  return {
    temperature_mean_C: conditions.tempC,
    temperature_min_C: Math.min(...temps),
    temperature_max_C: Math.max(...temps),
    pressure_mean_Pa: conditions.pressPa,
    humidity_mean_pct: conditions.rhPct,
    air_density_kg_m3: airDensityCipm2007(conditions),
    length_temp_coeff_ppm_per_K: fit ? fit.alpha_per_K * 1e6 : null,
    length_temp_coeff_u_ppm_per_K: fit ? fit.alpha_u_per_K * 1e6 : null,
    reference_temperature_C: conditions.tempC,
  };
}
