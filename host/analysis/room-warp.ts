// Pass times carried to the reference conditions: every interval divided by what the room did to the period then,
// so that a line through them gives T0 at the reference temperature (and the air at the mean conditions).
//
// The period at time t is T0_ref·w(t), w = (1 + (α/2)(T(t) − T_ref))·air(t)/air_mean. A line through the raw pass
// times weighs the periods unevenly (an OLS slope weighs the middle of the run most), so its T0 belongs to a
// temperature that is neither the mean of the readings nor known in advance: ±0.6 K on an 8-hour ±2 K cycle
// started at its peak, 1e-5 of g for brass. Warping the time axis, τ(t) = ∫ dt/w, removes that for any weighting.
import { airDensityCipm2007 } from './air-density.ts';
import { airPeriodFactor, roomAtTime, type RoomReading } from './room-drift.ts';

/** The room at each pass: temperature above the reference (K) and the air's period factor over the mean's. */
export interface PassConditions {
  readonly dT: Float64Array;
  readonly airRel: Float64Array;
}

/** The readings (sorted by time) interpolated at each time in `t`; the air only with a bob density. */
export function passConditions(t: ArrayLike<number>, readings: readonly RoomReading[], Tref: number, air: { bobDensity?: number; addedMassK?: number }): PassConditions {
  const k = air.addedMassK ?? 0.5;
  const airOf = (c: RoomReading): number => (air.bobDensity ? airPeriodFactor(airDensityCipm2007(c), air.bobDensity, k) : 1);
  const mean = (f: (r: RoomReading) => number): number => readings.reduce((s, r) => s + f(r), 0) / readings.length;
  const air0 = airOf({ t_s: 0, tempC: mean((r) => r.tempC), pressPa: mean((r) => r.pressPa), rhPct: mean((r) => r.rhPct) });
  const dT = new Float64Array(t.length);
  const airRel = new Float64Array(t.length);
  for (let i = 0; i < t.length; i++) {
    const c = roomAtTime(readings, t[i]!);
    dT[i] = c.tempC - Tref;
    airRel[i] = airOf(c) / air0;
  }
  return { dT, airRel };
}

/** w at each pass: the period there over the period at the reference conditions, for the coefficient α (1/K). */
export function periodFactors(c: PassConditions, alpha: number): Float64Array {
  const w = new Float64Array(c.dT.length);
  for (let i = 0; i < w.length; i++) w[i] = (1 + (alpha / 2) * c.dT[i]!) * c.airRel[i]!;
  return w;
}

/**
 * Warped device times: td + (τ(t) − t), τ(t) = ∫ dt/w by the trapezoid rule over the passes in time order (w moves
 * by parts in 1e9 between passes). `t` is the joined time (one axis for all boots), `td` the time within its boot.
 */
export function warpedTimes(td: ArrayLike<number>, t: ArrayLike<number>, w: ArrayLike<number>): Float64Array {
  const out = new Float64Array(td.length);
  let shift = 0;
  for (let i = 0; i < td.length; i++) {
    if (i > 0) shift += (t[i]! - t[i - 1]!) * 0.5 * (1 / w[i]! + 1 / w[i - 1]! - 2);
    out[i] = td[i]! + shift;
  }
  return out;
}
