// Damping of the swing from amplitude vs time: constant, linear, quadratic and mixed loss laws, and Q(A).
//
// Model: dA/dt = −(a0 + a1·A + a2·A²) (P. T. Squire, "Pendulum damping", Am. J. Phys. 54, 984 (1986); docs/references.md#ref-damping): a0 is
// constant (Coulomb, pivot) friction with A falling linearly, a1 viscous loss with A decaying exponentially, a2
// aerodynamic drag with 1/A rising linearly. The rate is measured in windows of the run (a straight line of A
// against t per window), then regressed on {1, A, A²} subsets by weighted least squares. The model is chosen by
// AICc (Akaike's criterion with the Hurvich–Tsai small-sample term; lower is better) with a free common scale of
// the windows' slope uncertainties. Q = πA/ΔA per cycle = πA/(T0·rate(A)) for small losses.
import { linearFit } from './least-squares.ts';
import type { DampingFit } from './result.ts';
import { median } from './stats.ts';

/** Rate of amplitude loss measured over one window. */
export interface RateWindow {
  readonly t_s: number;
  /** Mean amplitude of the window, radians. */
  readonly amplitude: number;
  /** −dA/dt, rad/s, and its standard uncertainty. */
  readonly rate: number;
  readonly rate_u: number;
}

/** The damping analysis. */
export interface DampingResult {
  readonly fits: DampingFit[];
  readonly best: DampingFit;
  readonly windows: RateWindow[];
  /** Q and the amplitude time constant A/|dA/dt| at the median amplitude, from the best fit. */
  readonly Q: number;
  readonly tau_s: number;
  readonly medianAmplitude: number;
}

/** −dA/dt of a fit at amplitude A (radians). */
export function lossRate(fit: Pick<DampingFit, 'a0' | 'a1' | 'a2'>, a: number): number {
  return fit.a0 + fit.a1 * a + fit.a2 * a * a;
}

/** Q at amplitude A for period T0: πA/(T0·rate). */
export function qualityFactor(fit: Pick<DampingFit, 'a0' | 'a1' | 'a2'>, a: number, t0: number): number {
  return (Math.PI * a) / (t0 * lossRate(fit, a));
}

/** Splits (t, A) into windows and measures the loss rate in each. */
export function rateWindows(t: ArrayLike<number>, a: ArrayLike<number>, windows: number): RateWindow[] {
  const n = t.length;
  const out: RateWindow[] = [];
  for (let w = 0; w < windows; w++) {
    const lo = Math.floor((w * n) / windows);
    const hi = Math.floor(((w + 1) * n) / windows);
    if (hi - lo < 4) continue;
    const tm = (t[lo]! + t[hi - 1]!) / 2;
    const fit = linearFit(hi - lo, (i) => a[lo + i]!, [() => 1, (i) => t[lo + i]! - tm]);
    if (!fit) continue;
    out.push({ t_s: tm, amplitude: fit.params[0]!, rate: -fit.params[1]!, rate_u: Math.sqrt(fit.cov[1]![1]!) });
  }
  return out;
}

const MODELS: readonly { model: DampingFit['model']; terms: readonly (0 | 1 | 2)[] }[] = [
  { model: 'constant', terms: [0] },
  { model: 'linear', terms: [1] },
  { model: 'quadratic', terms: [2] },
  { model: 'mixed', terms: [0, 1, 2] },
];

/**
 * Fits the four loss laws to amplitudes A (radians) at times t (s), Q at the median amplitude (given, or computed);
 * null when there are too few swings
 * (fewer than 40) or the amplitude does not measurably fall.
 */
export function fitDamping(t: ArrayLike<number>, a: ArrayLike<number>, t0: number, medianAmplitude?: number): DampingResult | null {
  const n = t.length;
  if (n < 40) return null;
  const windows = rateWindows(t, a, Math.max(5, Math.min(60, Math.floor(n / 20))));
  if (windows.length < 5) return null;
  const fits: DampingFit[] = [];
  for (const { model, terms } of MODELS) {
    if (windows.length <= terms.length + 1) continue;
    const basis = terms.map((p) => (i: number) => windows[i]!.amplitude ** p);
    const fit = linearFit(windows.length, (i) => windows[i]!.rate, basis, (i) => 1 / Math.max(windows[i]!.rate_u, 1e-30) ** 2);
    if (!fit) continue;
    const k = terms.length;
    const m = windows.length;
    const coef = [0, 0, 0];
    terms.forEach((p, j) => (coef[p] = fit.params[j]!));
    const score = m * Math.log(Math.max(fit.chi2, 1e-300) / m) + 2 * k + (2 * k * (k + 1)) / Math.max(1, m - k - 1);
    let ss = 0;
    for (const w of windows) ss += (w.rate - lossRate({ a0: coef[0]!, a1: coef[1]!, a2: coef[2]! }, w.amplitude)) ** 2;
    fits.push({ model, score, a0: coef[0]!, a1: coef[1]!, a2: coef[2]!, rms_residual_deg: (Math.sqrt(ss / m) * 180) / Math.PI });
  }
  if (fits.length === 0) return null;
  const medA = medianAmplitude ?? median(a);
  const best = fits.reduce((b, f) => (f.score < b.score ? f : b));
  const rate = lossRate(best, medA);
  if (!(rate > 0)) return null;
  return { fits, best, windows, Q: qualityFactor(best, medA, t0), tau_s: medA / rate, medianAmplitude: medA };
}
