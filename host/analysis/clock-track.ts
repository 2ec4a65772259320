// The device clock's rate tracked through the run: a piecewise-linear rate in host time fitted to the lower
// envelope of the heartbeats, so that a rate that wanders (a resonator following the room) is integrated into
// the pass times instead of averaged over them.
//
// Why in time and not against the room's temperature: the resonator sits at the board's temperature, which lags
// the air the sensor reads and carries the board's own heat; a rate regressed on the air temperature would force
// that (unknown) relation and, worse, share its regressor with the length's coefficient, so any misfit would pass
// straight into α (each ppm/K of clock reads as 2 ppm/K of expansion). A rate in time assumes only that the rate
// moves slowly against the knot spacing, needs no room readings, and follows drift of any cause (ageing, warm-up).
//
// Model, after the constant-rate fit k0 = 1 + ppm0·1e-6 (clock-calibration.ts): y = h − x/k0 = a_boot − E(t) +
// latency, with x the nominal device seconds, h the host time, E(t) = ∫ e dt the integral of the rate's fractional
// excursion e = k(t)/k0 − 1, e piecewise linear between knots equally spaced in host time (E a quadratic spline).
// The fit runs on window minima as the constant fit does. Knot spacing: the shortest of a ladder for which one
// interval's rate, from the minima it holds, has a standard uncertainty ≤ TARGET_RATE_U (σ of the minima from the
// residuals of the finest knots, which follow any rate a resonator can have). The track is kept only when it fits the
// minima significantly better than the constant rate (an F test), so a constant-rate run keeps its one rate. Figures and
// reasoning: docs/room-clock.md, docs/references.md#ref-room-clock.
import { linearFit } from './least-squares.ts';
import { lag1, robustSigma } from './stats.ts';
import type { BootHeartbeats } from './clock-calibration.ts';

/** The tracked excursion of the rate about k0: plain data (it crosses to the result worker's callers). */
export interface RateTrack {
  /** k0 = 1 + ppm0·1e-6: the constant rate the excursion is about. */
  readonly k0: number;
  /** Knots, host s, equally spaced; the rate is held flat beyond the ends. */
  readonly knots_s: readonly number[];
  /** Host times of the first and last window minimum fitted (s). */
  readonly from_s: number;
  readonly to_s: number;
  /** Fractional rate excursion e at each knot, and its covariance. */
  readonly e: readonly number[];
  readonly cov: readonly (readonly number[])[];
  /** The window minima's noise (s), the F statistic against a constant rate, and the windows kept. */
  readonly sigma_s: number;
  readonly f_stat: number;
  readonly windows: number;
}

/** One interval's rate is aimed at this standard uncertainty (0.3 ppm, 0.03 K of a 10 ppm/K resonator; α averages many). */
export const TARGET_RATE_U = 3e-7;
/** Knot spacings tried, shortest first (s). */
const LADDER_S = [600, 900, 1200, 1800, 2700, 3600, 5400, 7200];
/** Window of the minima (s): 60 heartbeats at the default 1 s reach the latency floor. */
const WINDOW_S = 60;

interface Minimum {
  /** Index among all the run's minima (into precomputed columns). */
  readonly i: number;
  readonly boot: number;
  readonly h: number;
  readonly y: number;
}

/** ∫ from knots[0] to t of the hat function of knot j (flat continuation of the end hats beyond the knots). */
export function hatIntegral(knots: readonly number[], j: number, t: number): number {
  const d = knots[1]! - knots[0]!;
  const last = knots.length - 1;
  const u = (t - knots[0]!) / d;
  const a = j - 1;
  // The hat of knot j rises on [j−1, j] and falls on [j, j+1] (in units of d from knots[0]).
  const rise = (v: number): number => (v <= a ? 0 : v >= j ? 0.5 : 0.5 * (v - a) ** 2);
  const fall = (v: number): number => (v <= j ? 0 : v >= j + 1 ? 0.5 : (v - j) - 0.5 * (v - j) ** 2);
  let s = (j > 0 ? rise(Math.min(u, j)) : 0) + (j < last ? fall(Math.min(u, j + 1)) : 0);
  if (j === 0 && u < 0) s = u;
  if (j === last && u > last) s += u - last;
  return s * d;
}

/** The rate excursion at host time t (fraction). */
export function rateExcursion(tr: RateTrack, t: number): number {
  const k = tr.knots_s;
  const d = k[1]! - k[0]!;
  const u = Math.min(Math.max((t - k[0]!) / d, 0), k.length - 1);
  const i = Math.min(Math.floor(u), k.length - 2);
  const f = u - i;
  return tr.e[i]! * (1 - f) + tr.e[i + 1]! * f;
}

/** Per track, C[i] = Σ_{j<i} e_j·(area of hat j, whole): E(t) then needs only the hats around t (once per pass). */
const wholeHats = new WeakMap<RateTrack, Float64Array>();

function wholeHatSums(tr: RateTrack): Float64Array {
  let c = wholeHats.get(tr);
  if (c) return c;
  const last = tr.e.length - 1;
  const d = tr.knots_s[1]! - tr.knots_s[0]!;
  c = new Float64Array(tr.e.length + 1);
  for (let j = 0; j < tr.e.length; j++) c[j + 1] = c[j]! + tr.e[j]! * d * ((j > 0 ? 0.5 : 0) + (j < last ? 0.5 : 0));
  wholeHats.set(tr, c);
  return c;
}

/**
 * E(t) = ∫ e dt from the first knot to host time t (s). The hats ending at or before t count whole (j + 1 ≤ ⌊u⌋ − 1,
 * never the last, whose flat continuation grows with t); those starting after t count nothing (j ≥ ⌊u⌋ + 2).
 */
export function excursionIntegral(tr: RateTrack, t: number): number {
  const knots = tr.knots_s;
  const last = tr.e.length - 1;
  if (last < 1) return tr.e.length ? tr.e[0]! * hatIntegral(knots, 0, t) : 0;
  const fu = Math.floor((t - knots[0]!) / (knots[1]! - knots[0]!));
  const lo = Math.min(last, Math.max(0, fu - 1));
  const hi = Math.min(last, Math.max(0, fu + 1));
  let s = wholeHatSums(tr)[lo]!;
  for (let j = lo; j <= hi; j++) if (tr.e[j] !== 0) s += tr.e[j]! * hatIntegral(knots, j, t);
  return s;
}

/**
 * Seconds since a boot's tick 0 for `x` nominal device seconds of that boot: x/k0 − (E(t) − E(t0)), with the boot's
 * tick 0 at host time t0 (an offset from the constant fit is close enough: E moves by ppm per second).
 */
export function trackedSeconds(tr: RateTrack, t0: number, x: number): number {
  const s = x / tr.k0;
  return s - (excursionIntegral(tr, t0 + s) - excursionIntegral(tr, t0));
}

/** Variance of Σ c_j e_j for a linear functional c of the knot excursions. */
export function functionalVariance(tr: RateTrack, c: readonly number[]): number {
  let v = 0;
  for (let i = 0; i < c.length; i++) for (let j = 0; j < c.length; j++) v += c[i]! * tr.cov[i]![j]! * c[j]!;
  return Math.max(0, v);
}

/** The mean excursion over [a, b] (host s) and its standard uncertainty. */
export function meanExcursion(tr: RateTrack, a: number, b: number): { e: number; u: number } {
  const c = tr.e.map((_, j) => (hatIntegral(tr.knots_s, j, b) - hatIntegral(tr.knots_s, j, a)) / (b - a));
  return { e: c.reduce((s, v, j) => s + v * tr.e[j]!, 0), u: Math.sqrt(functionalVariance(tr, c)) };
}

/**
 * The slope of the rate excursion against a temperature series (ΔT at host times), and its standard uncertainty
 * from the track's covariance: a rate error that follows the temperature by s reads as 2s of length coefficient.
 */
export function temperatureSlope(tr: RateTrack, t: readonly number[], dT: readonly number[]): { s: number; u: number } | null {
  const n = t.length;
  const mean = dT.reduce((a, v) => a + v, 0) / n;
  const stt = dT.reduce((a, v) => a + (v - mean) ** 2, 0);
  if (!(stt > 0)) return null;
  const c = tr.e.map(() => 0);
  const d = tr.knots_s[1]! - tr.knots_s[0]!;
  for (let i = 0; i < n; i++) {
    const u = Math.min(Math.max((t[i]! - tr.knots_s[0]!) / d, 0), tr.e.length - 1);
    const j = Math.min(Math.floor(u), tr.e.length - 2);
    const w = (dT[i]! - mean) / stt;
    c[j]! += w * (1 - (u - j));
    c[j + 1]! += w * (u - j);
  }
  return { s: c.reduce((a, v, j) => a + v * tr.e[j]!, 0), u: Math.sqrt(functionalVariance(tr, c)) };
}

function windowMinima(boots: readonly BootHeartbeats[], k0: number): Minimum[] {
  const out: Minimum[] = [];
  for (const b of boots) {
    let cur = NaN;
    let best: Minimum | null = null;
    for (let i = 0; i < b.deviceS.length; i++) {
      const w = Math.floor((b.deviceS[i]! - b.deviceS[0]!) / WINDOW_S);
      const y = b.hostS[i]! - b.deviceS[i]! / k0;
      if (w !== cur) {
        if (best) out.push(best);
        cur = w;
        best = null;
      }
      if (!best || y < best.y) best = { i: out.length, boot: b.boot, h: b.hostS[i]!, y };
    }
    if (best) out.push(best);
  }
  return out;
}

/** The knot spacing the noise allows, or null when the minima span fewer than two intervals of it. */
function knotSpacing(sigma: number, span: number): number | null {
  for (const d of LADDER_S) {
    const perInterval = d / WINDOW_S;
    if (span < 2 * d) return null;
    if ((sigma * Math.sqrt(12)) / (d * Math.sqrt(perInterval)) <= TARGET_RATE_U) return d;
  }
  return null;
}

/** Per-boot intercepts plus the given columns, fitted to the minima. */
function fitMinima(ms: readonly Minimum[], cols: readonly ((m: Minimum) => number)[]) {
  const boots = [...new Set(ms.map((m) => m.boot))];
  const basis = [...boots.map((b) => (i: number) => (ms[i]!.boot === b ? 1 : 0)), ...cols.map((f) => (i: number) => f(ms[i]!))];
  const fit = linearFit(ms.length, (i) => ms[i]!.y, basis);
  return fit ? { fit, nb: boots.length, boots } : null;
}

/** Knots every `d` s over the minima, their fit after removing windows far above the envelope (twice), and its residual σ. */
function fitKnots(ms0: readonly Minimum[], h0: number, span: number, d: number) {
  const nk = Math.ceil(span / d) + 1;
  const knots = Array.from({ length: nk }, (_, j) => h0 + j * d);
  const cols = knots.map((_, j) => {
    const col = Float64Array.from(ms0, (m) => -hatIntegral(knots, j, m.h));
    return (m: Minimum) => col[m.i]!;
  });
  let ms = ms0;
  for (let pass = 0; pass < 3; pass++) {
    const pf = fitMinima(ms, cols);
    if (!pf || pf.fit.dof < 4) return null;
    const res = ms.map((m) => m.y - predicted(pf, cols, m));
    const sigma = Math.max(robustSigma(res), 1e-7);
    if (pass === 2) return { pf, ms, knots, sigma, rho: Math.max(0, Math.min(0.99, lag1(res))) };
    ms = ms.filter((_, i) => res[i]! < 4 * sigma);
  }
  return null;
}

/**
 * Tracks the rate about k0 from heartbeats; null when the run is too short for two knot intervals, the minima
 * too few, or the track no better than the constant rate. σ of the minima comes from the residuals of the
 * finest knots, which follow any rate a resonator can have.
 */
export function trackClockRate(boots: readonly BootHeartbeats[], ppm0: number): RateTrack | null {
  const k0 = 1 + ppm0 * 1e-6;
  const all = windowMinima(boots, k0);
  if (all.length < 16) return null;
  const hs = all.map((m) => m.h);
  const h0 = Math.min(...hs);
  const span = Math.max(...hs) - h0;
  if (span < 2 * LADDER_S[0]!) return null;
  const fine = fitKnots(all, h0, span, LADDER_S[0]!);
  const d = fine && knotSpacing(fine.sigma, span);
  const got = d === null || !fine ? null : d === LADDER_S[0] ? fine : fitKnots(all, h0, span, d);
  if (!got) return null;
  const { pf, ms, knots } = got;
  const flat = fitMinima(ms, [(m) => m.h]);
  if (!flat) return null;
  const extra = knots.length - 1;
  const f = (flat.fit.chi2 - pf.fit.chi2) / extra / (pf.fit.chi2 / pf.fit.dof);
  // F(extra, dof) has mean ≈ 1 and sd ≈ √(2/extra): 4 sd is p ≈ 1e-4 or less.
  if (!(f > 1 + 4 * Math.sqrt(2 / extra))) return null;
  const i0 = pf.nb;
  // The minima's errors are not independent (the USB frame phase drifts slowly through them): inflate the
  // covariance by (1 + ρ)/(1 − ρ), ρ their lag-1 autocorrelation.
  const inflate = (1 + got.rho) / (1 - got.rho);
  return {
    k0,
    knots_s: knots,
    from_s: h0,
    to_s: h0 + span,
    e: knots.map((_, j) => pf.fit.params[i0 + j]!),
    cov: knots.map((_, i) => knots.map((__, j) => pf.fit.cov[i0 + i]![i0 + j]! * inflate)),
    sigma_s: got.sigma,
    f_stat: f,
    windows: ms.length,
  };
}

function predicted(pf: NonNullable<ReturnType<typeof fitMinima>>, cols: readonly ((m: Minimum) => number)[], m: Minimum): number {
  let s = pf.fit.params[pf.boots.indexOf(m.boot)]!;
  cols.forEach((c, j) => (s += pf.fit.params[pf.nb + j]! * c(m)));
  return s;
}
