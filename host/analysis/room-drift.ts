// The effective length's temperature coefficient from the period's drift against the room's temperature, and
// the length carried to a reference temperature: pure, for the analysis to compose once the room is wired in.
//
// Model: T0(t) = T0_ref · (1 + (α/2)(T(t) − T_ref)) · air(ρ(t)), with air(ρ) = √((1 + kρ/ρ_b)/(1 − ρ/ρ_b)) the
// buoyancy and added-mass factor (the same as the analysis's correction) and ρ by CIPM-2007. No lag between
// the air the sensor reads and the string is modelled: a string of a fraction of a millimetre follows the
// air within seconds to minutes, against a room that moves over hours; a lag would show as a loop of T0
// against T (the residuals would follow dT/dt), which the test runs would see as a biased coefficient.
import { airDensityCipm2007 } from './air-density.ts';
import { linearFit } from './least-squares.ts';
import { lag1 } from './stats.ts';

export interface RoomReading {
  /** Seconds on the same time axis as the periods. */
  readonly t_s: number;
  readonly tempC: number;
  readonly pressPa: number;
  readonly rhPct: number;
}

export interface PeriodPoint {
  readonly t_s: number;
  /** The period reduced to zero amplitude. */
  readonly T0_s: number;
  /**
   * The amplitude the period was reduced with (rad). Given, θ² is a regressor beside the temperature: an error of
   * the reduction grows with θ² (a flag width off by δw moves T0 by (θ²/8)·δw/w), and the amplitude decays through
   * the run, so without it such an error would pass into α through the decay's overlap with the temperature cycle.
   */
  readonly amplitude_rad?: number;
}

export interface LengthDriftFit {
  /** α of the effective length (1/K) and its standard uncertainty: statistics (autocorrelation included) and the air correction. */
  readonly alpha_per_K: number;
  readonly alpha_u_per_K: number;
  /** The air correction's share of that uncertainty (1/K). */
  readonly alpha_u_air_per_K: number;
  /** The mean of the readings' temperatures, at which T0_ref holds. */
  readonly reference_temperature_C: number;
  /** T0 at the reference temperature, air factor at the mean conditions included. */
  readonly T0_ref_s: number;
  readonly T0_ref_u_s: number;
  readonly n: number;
}

/** Buoyancy and added mass: T ∝ √((1 + kρ/ρ_b)/(1 − ρ/ρ_b)) (ω² = g(M − m_air)L / ((M + k m_air)L²)). */
export function airPeriodFactor(rho: number, bobDensity: number, addedMassK: number): number {
  return Math.sqrt((1 + (addedMassK * rho) / bobDensity) / (1 - rho / bobDensity));
}

/** Linear interpolation of the readings at t (clamped at the ends); readings sorted by time. */
export function roomAtTime(readings: readonly RoomReading[], t: number): RoomReading {
  let lo = 0;
  let hi = readings.length - 1;
  if (t <= readings[0]!.t_s) return readings[0]!;
  if (t >= readings[hi]!.t_s) return readings[hi]!;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (readings[mid]!.t_s <= t) lo = mid;
    else hi = mid;
  }
  const a = readings[lo]!;
  const b = readings[hi]!;
  const f = (t - a.t_s) / (b.t_s - a.t_s);
  const mix = (x: number, y: number): number => x + f * (y - x);
  return { t_s: t, tempC: mix(a.tempC, b.tempC), pressPa: mix(a.pressPa, b.pressPa), rhPct: mix(a.rhPct, b.rhPct) };
}

/**
 * Fits T0 against temperature after removing the air's share (when the bob density is known). Needs periods
 * spanning a temperature range; returns null with fewer than 10 periods or no temperature spread.
 */
export function fitLengthDrift(
  periods: readonly PeriodPoint[],
  readings: readonly RoomReading[],
  opts: { bobDensity?: number; addedMassK?: number; airRelU?: number } = {},
): LengthDriftFit | null {
  if (periods.length < 10 || readings.length < 2) return null;
  const ref = readings.reduce((s, r) => s + r.tempC, 0) / readings.length;
  const k = opts.addedMassK ?? 0.5;
  const mean = {
    tempC: ref,
    pressPa: readings.reduce((s, r) => s + r.pressPa, 0) / readings.length,
    rhPct: readings.reduce((s, r) => s + r.rhPct, 0) / readings.length,
  };
  const airMean = opts.bobDensity ? airPeriodFactor(airDensityCipm2007(mean), opts.bobDensity, k) : 1;
  const x: number[] = [];
  const raw: number[] = [];
  const y: number[] = [];
  for (const p of periods) {
    const c = roomAtTime(readings, p.t_s);
    const air = opts.bobDensity ? airPeriodFactor(airDensityCipm2007(c), opts.bobDensity, k) / airMean : 1;
    x.push(c.tempC - ref);
    raw.push(p.T0_s);
    y.push(p.T0_s / air);
  }
  const withAmp = periods.every((p) => p.amplitude_rad !== undefined);
  const th2 = withAmp ? periods.reduce((s, p) => s + p.amplitude_rad! ** 2, 0) / periods.length : 0;
  const basis = [() => 1, (i: number) => x[i]!, ...(withAmp ? [(i: number) => periods[i]!.amplitude_rad! ** 2 - th2] : [])];
  const line = (ys: readonly number[]) => linearFit(ys.length, (i) => ys[i]!, basis);
  const fit = line(y);
  if (!fit || !(fit.cov[1]![1]! > 0)) return null;
  const [a, b] = fit.params as [number, number];
  const alpha = (2 * b) / a;
  const c2 = withAmp ? fit.params[2]! : 0;
  const resid = y.map((v, i) => v - a - b * x[i]! - (withAmp ? c2 * (periods[i]!.amplitude_rad! ** 2 - th2) : 0));
  const rho = Math.max(0, Math.min(0.99, lag1(resid)));
  // Correlated residuals carry less information than their number says: inflate by √((1 + ρ)/(1 − ρ)).
  const inflate = Math.sqrt((1 + rho) / (1 - rho));
  const ua = Math.sqrt(fit.cov[0]![0]!) * inflate;
  const uStat = ((2 * Math.sqrt(fit.cov[1]![1]!)) / a) * inflate;
  // The air correction's share of α, known to airRelU (bob density and k; 10 %, common practice, no source).
  const plain = opts.bobDensity ? line(raw) : null;
  const uAir = plain ? Math.abs(alpha - (2 * plain.params[1]!) / plain.params[0]!) * (opts.airRelU ?? 0.1) : 0;
  return {
    alpha_per_K: alpha,
    alpha_u_per_K: Math.hypot(uStat, uAir),
    alpha_u_air_per_K: uAir,
    reference_temperature_C: ref,
    T0_ref_s: a,
    T0_ref_u_s: ua,
    n: y.length,
  };
}

/** A length measured at `measuredC`, carried to `toC` with the coefficient α (1/K). */
export function lengthAt(length_m: number, measuredC: number, alphaPerK: number, toC: number): number {
  return length_m * (1 + alphaPerK * (toC - measuredC));
}

/** One block of the run: its T0 (a line through its own passes, times warped to the reference), u, and mean ΔT. */
export interface BlockT0 {
  readonly dT: number;
  /** Mean θ² of the block's passes (rad²). */
  readonly theta2: number;
  readonly T0: number;
  readonly u: number;
}

/**
 * The temperature slope left in warped block T0s: T0_b = a + s·ΔT_b weighted by 1/u_b². Each block's T0 comes from
 * a line through its pass times, whose uncertainty models white timing noise and a random walk (t0-line-fit.ts);
 * blocks share no passes, so their errors are independent, which consecutive periods' are not (a period's error
 * is the difference of two pass times': fitted as independent they overstate the uncertainty some fiftyfold).
 * The slope's uncertainty is scaled up by the Birge ratio √(χ²/ν) when the blocks scatter more than they claim.
 */
export function fitBlocks(blocks: readonly BlockT0[]): { a: number; s: number; u_s: number; birge: number } | null {
  if (blocks.length < 5) return null;
  const th = blocks.reduce((s, b) => s + b.theta2, 0) / blocks.length;
  const fit = linearFit(blocks.length, (i) => blocks[i]!.T0, [() => 1, (i) => blocks[i]!.dT, (i) => blocks[i]!.theta2 - th], (i) => 1 / blocks[i]!.u ** 2);
  if (!fit || !(fit.cov[1]![1]! > 0)) return null;
  const [a, s] = fit.params as [number, number];
  // linearFit scales the covariance by χ²/ν both ways; the blocks' own u are kept as a floor.
  const birge = Math.sqrt(fit.chi2 / fit.dof);
  if (!(birge > 0)) return null;
  return { a, s, u_s: (Math.sqrt(fit.cov[1]![1]!) / birge) * Math.max(1, birge), birge };
}

