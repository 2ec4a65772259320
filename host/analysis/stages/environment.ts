// Stage: the room beside the swing (A records): its means and range, the air density at the mean conditions
// (CIPM-2007, x_CO2 = 0.0004), the effective length's temperature coefficient from the reduced periods, and T0
// carried to the reference temperature (the mean of the readings) with the length carried there for g.
//
// Amplitudes follow the room: θ from a transit time needs the length (block half-angle w/2L) and ω0, and both move
// with the temperature (θ ∝ L^(−1/2)); with a fixed L the reduction hides θ²/8 of α (0.5 % at 11°). So the
// coefficient is fitted once on the reduction's amplitudes, the amplitudes are solved again with L(T) and ω0(T),
// and the coefficient fitted again (a second round would move it by θ²/8 of the first round's change: nothing).
//
// No lag between the air and the string is modelled: a wire follows the air with τ = ρc·r/(2h), under a minute for a
// 0.2 mm steel wire, against blocks of ≥ 10 min and a room that moves over hours (docs/room-clock.md,
// docs/references.md#ref-string-lag). The device clock's rate is tracked through the run before this stage
// (host/analysis/clock-track.ts); its uncertainty's slope against the temperature joins u(α).
import { airDensityCipm2007 } from '../air-density.ts';
import { temperatureSlope, type RateTrack } from '../clock-track.ts';
import type { SequencedPasses } from '../passes.ts';
import { stokesAddedMassK } from '../pendulum-corrections.ts';
import { reducePeriods } from '../period-law.ts';
import type { BudgetLine, EnvironmentResult } from '../result.ts';
import { fitBlocks, fitLengthDrift, lengthAt, type BlockT0, type LengthDriftFit, type RoomReading } from '../room-drift.ts';
import { passConditions, periodFactors, warpedTimes, type PassConditions } from '../room-warp.ts';
import { amplitudeFromTransit, blockHalfAngle } from '../transit-amplitude.ts';
import type { Rig } from '../../../protocol/rig.ts';
import { fillPeriodAmplitudes } from './amplitudes.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';
import { lineT0, type T0Estimate } from './t0-line.ts';

const mean = (xs: readonly number[]): number => xs.reduce((s, v) => s + v, 0) / xs.length;

/** What the room changes downstream: T0 at the reference temperature, the rig there, and the budget's rows. */
export interface RoomStage {
  readonly environment: EnvironmentResult | null;
  /** The line through the warped pass times (T0 at the reference temperature); null: keep the plain line. */
  readonly t0: T0Estimate | null;
  /** The rig at the reference conditions: length carried from length_temp_C, air density of the readings. */
  readonly rig: Rig | null;
  /** Relative standard uncertainty of T0 from the coefficient's (the warp's share). */
  readonly T0_rel: number;
  readonly rows: BudgetLine[];
}

/** The periods' reduced values and mid times inside the readings' span (outside it the temperature is not known). */
function periodPoints(passes: SequencedPasses, periods: Periods, red: Reduction, P0: ArrayLike<number>, pAmp: ArrayLike<number>, sorted: readonly RoomReading[]) {
  const pts: { t_s: number; T0_s: number; amplitude_rad: number }[] = [];
  for (let i = 0; i < periods.P.length; i++) {
    if (!red.keep[i] || !Number.isFinite(P0[i]!)) continue;
    const t = Number(passes.t[periods.ends[i]!]) - periods.P[i]! / 2;
    if (t >= sorted[0]!.t_s && t <= sorted.at(-1)!.t_s && Number.isFinite(pAmp[i]!)) pts.push({ t_s: t, T0_s: P0[i]!, amplitude_rad: pAmp[i]! });
  }
  return pts;
}

/** Amplitudes of every pass with the length and ω0 of its moment (rad), the periods reduced with them, and w per pass. */
function roomAmplitudes(c: RoomContext, alpha: number, shift: { dTransit?: number; dWidth?: number } = {}) {
  const { passes, periods, red, rig } = c;
  const w = periodFactors(c.cond, alpha);
  const omega0 = (2 * Math.PI) / red.T0mean!;
  const L_ref = lengthAt(rig.length_m, c.lengthC, alpha, c.Tref);
  const solve = (k: number): number => {
    const L = L_ref * (1 + alpha * c.cond.dT[k]!);
    return amplitudeFromTransit(passes.transit[k]! + (shift.dTransit ?? 0), blockHalfAngle(rig.flag_width_m + (shift.dWidth ?? 0), L), omega0 / w[k]!);
  };
  const amp = new Float64Array(passes.t.length).fill(NaN);
  const pAmp = new Float64Array(periods.ends.length).fill(NaN);
  fillPeriodAmplitudes(periods, passes.index, solve, amp, pAmp);
  return { amp, pAmp, P0: reducePeriods(periods.P, pAmp), w };
}

/** What the room's fits share: the passes and their periods, the readings, the rig, the reference and the air model. */
interface RoomContext {
  readonly passes: SequencedPasses;
  readonly periods: Periods;
  readonly red: Reduction;
  readonly rig: Rig;
  readonly sorted: readonly RoomReading[];
  readonly Tref: number;
  readonly lengthC: number;
  readonly air: ReturnType<typeof airModel>;
  readonly cond: PassConditions;
}

/** The T0 line through the pass times warped with α (amplitudes as given), over all passes or ranges of them. */
function warpedLines(c: RoomContext, alpha: number, amps: ReturnType<typeof roomAmplitudes>, ranges: readonly (readonly [number, number] | undefined)[]): T0Estimate[] {
  const rigAt: Rig = { ...c.rig, length_m: lengthAt(c.rig.length_m, c.lengthC, alpha, c.Tref) };
  const w = periodFactors(c.cond, alpha);
  const passes = { ...c.passes, td: warpedTimes(c.passes.td, c.passes.t, w) };
  const red = { ...c.red, amp: amps.amp, pAmp: amps.pAmp, P0: amps.P0 };
  return ranges.map((r) => lineT0(passes, c.periods, red, rigAt, r));
}

/** The coefficient from blocks of ≥ 10 min (≥ 8 of them when the run allows): see fitBlocks (room-drift.ts). */
function blockCoefficient(c: RoomContext, alpha: number, amps: ReturnType<typeof roomAmplitudes>): { alpha: number; u: number } | null {
  const t = c.passes.t;
  const n = t.length;
  const from = c.sorted[0]!.t_s;
  const to = c.sorted.at(-1)!.t_s;
  const len = Math.max(600, (to - from) / 64);
  const ranges: [number, number][] = [];
  for (let lo = 0; lo < n; ) {
    let hi = lo + 1;
    const k = Math.floor((t[lo]! - from) / len);
    while (hi < n && Math.floor((t[hi]! - from) / len) === k) hi++;
    if (t[lo]! >= from && t[hi - 1]! <= to && hi - lo >= 50) ranges.push([lo, hi]);
    lo = hi;
  }
  const lines = warpedLines(c, alpha, amps, ranges);
  const blocks: BlockT0[] = [];
  ranges.forEach(([lo, hi], j) => {
    const line = lines[j]!.line;
    let dT = 0;
    let a2 = 0;
    let na = 0;
    for (let i = lo; i < hi; i++) {
      dT += c.cond.dT[i]!;
      if (Number.isFinite(amps.amp[i]!)) (a2 += amps.amp[i]! ** 2), na++;
    }
    if (line && line.u_T0 > 0 && na > 0) blocks.push({ dT: dT / (hi - lo), theta2: a2 / na, T0: line.T0, u: line.u_T0 });
  });
  const f = fitBlocks(blocks);
  return f ? { alpha: alpha + (2 * f.s) / f.a, u: (2 * f.u_s) / f.a } : null;
}

/**
 * The air's share as the corrections stage applies it (pendulum-corrections.ts): added mass in the middle of
 * potential flow (k = 1/2) and Stokes' oscillating sphere, its half-range a rectangular uncertainty beside 10 % of
 * the share for the bob density (common practice, no source). Without a bob density the coefficient keeps the air's share.
 */
function airModel(rig: Rig | null, rho: number, T0: number | null): { bobDensity?: number; addedMassK?: number; airRelU?: number } {
  if (rig?.bob_density_kg_m3 === undefined || T0 === null) return {};
  const hi = stokesAddedMassK(rho, rig.bob_diameter_m !== undefined ? rig.bob_diameter_m / 2 : undefined, (2 * Math.PI) / T0);
  const k = (0.5 + hi) / 2;
  return { bobDensity: rig.bob_density_kg_m3, addedMassK: k, airRelU: Math.hypot(0.1, (hi - 0.5) / 2 / Math.sqrt(3) / (1 + k)) };
}

/**
 * The coefficient and T0 at the reference temperature. α first from the periods (room-drift.ts), the amplitudes
 * solved again with it, then α from blocks of warped pass times (its statistics), and the systematic terms: the
 * air's share and the reduction's (the transit read 5 µs long, the flag width off by its u) through the periods.
 */
function coefficientAndT0(c: RoomContext, fit0: LengthDriftFit, delayU_s: number, uClock: number) {
  const periodAlpha = (a: { P0: ArrayLike<number>; pAmp: ArrayLike<number> }) => fitLengthDrift(periodPoints(c.passes, c.periods, c.red, a.P0, a.pAmp, c.sorted), c.sorted, c.air);
  // Amplitudes with α from the periods: the later α differ from it by far less than would move an amplitude.
  const amps = roomAmplitudes(c, fit0.alpha_per_K);
  const fit1 = periodAlpha(amps) ?? fit0;
  const blocks = blockCoefficient(c, fit1.alpha_per_K, amps);
  const alpha = blocks ? blocks.alpha : fit1.alpha_per_K;
  const moved = (shift: { dTransit?: number; dWidth?: number }): number =>
    Math.abs((periodAlpha(roomAmplitudes(c, fit0.alpha_per_K, shift))?.alpha_per_K ?? fit1.alpha_per_K) - fit1.alpha_per_K);
  const uRed = Math.hypot(moved({ dTransit: delayU_s }), moved({ dWidth: c.rig.flag_width_u_m }));
  const u = Math.hypot(blocks ? Math.hypot(blocks.u, fit1.alpha_u_air_per_K, uRed) : fit1.alpha_u_per_K, uClock);
  const [t0] = warpedLines(c, alpha, amps, [undefined]) as [T0Estimate];
  const [t0moved] = warpedLines(c, alpha + u, amps, [undefined]) as [T0Estimate];
  const T0_rel = t0.T0 !== null && t0moved.T0 !== null ? Math.abs(t0moved.T0 / t0.T0 - 1) : 0;
  return { alpha, u, t0, T0_rel };
}

/**
 * The tracked clock rate's share of u(α): the pass times follow the tracked rate, so its error that moves with the
 * temperature, slope s against the readings' ΔT, reads as 2s of coefficient; u(s) from the track's covariance.
 */
function clockAlphaU(track: RateTrack | undefined, sorted: readonly RoomReading[], Tref: number): number {
  const slope = track ? temperatureSlope(track, sorted.map((r) => r.t_s), sorted.map((r) => r.tempC - Tref)) : null;
  return slope ? 2 * slope.u : 0;
}

/** The room stage; without readings (or without a temperature spread) it changes nothing downstream. */
export function roomStage(room: readonly RoomReading[] | undefined, passes: SequencedPasses, periods: Periods, red: Reduction, rig: Rig | null, delayU_s: number, clock?: RateTrack): RoomStage {
  const none = { t0: null, rig, T0_rel: 0, rows: [] };
  if (!room || room.length === 0) return { environment: null, ...none };
  const sorted = [...room].sort((a, b) => a.t_s - b.t_s);
  const temps = sorted.map((r) => r.tempC);
  const conditions = { tempC: mean(temps), pressPa: mean(sorted.map((r) => r.pressPa)), rhPct: mean(sorted.map((r) => r.rhPct)) };
  const rho = airDensityCipm2007(conditions);
  const Tref = conditions.tempC;
  const air = airModel(rig, rho, red.T0mean);
  const spread = Math.max(...temps) - Math.min(...temps) > 0.1;
  const fit0 = spread ? fitLengthDrift(periodPoints(passes, periods, red, red.P0, red.pAmp, sorted), sorted, air) : null;
  let coeff: { alpha: number; u: number } | null = fit0 && { alpha: fit0.alpha_per_K, u: fit0.alpha_u_per_K };
  let out: Omit<RoomStage, 'environment'> = { ...none, rig: rig && { ...rig, air_density_kg_m3: rho } };
  if (fit0 && rig && red.T0mean !== null) {
    const lengthC = rig.length_temp_C ?? Tref;
    const cond = passConditions(passes.t, sorted, Tref, air);
    const r = coefficientAndT0({ passes, periods, red, rig, sorted, Tref, lengthC, air, cond }, fit0, delayU_s, clockAlphaU(clock, sorted, Tref));
    coeff = r;
    const rows: BudgetLine[] = [
      { id: 'room-T0', name: 'T0 carried to the reference temperature', u_rel_g: 2 * r.T0_rel, note: { kind: 'temperature-coefficient', per_K: r.alpha, u_per_K: r.u, reference_C: Tref } },
      { id: 'room-length', name: 'length carried to the reference temperature', u_rel_g: r.u * Math.abs(Tref - lengthC), note: { kind: 'length-carried', measured_C: lengthC, reference_C: Tref } },
    ];
    out = { t0: r.t0, rig: { ...rig, length_m: lengthAt(rig.length_m, lengthC, r.alpha, Tref), air_density_kg_m3: rho }, T0_rel: r.T0_rel, rows };
  }
  return {
    environment: {
      temperature_mean_C: conditions.tempC,
      temperature_min_C: Math.min(...temps),
      temperature_max_C: Math.max(...temps),
      pressure_mean_Pa: conditions.pressPa,
      humidity_mean_pct: conditions.rhPct,
      air_density_kg_m3: rho,
      length_temp_coeff_ppm_per_K: coeff ? coeff.alpha * 1e6 : null,
      length_temp_coeff_u_ppm_per_K: coeff ? coeff.u * 1e6 : null,
      reference_temperature_C: Tref,
    },
    ...out,
  };
}
