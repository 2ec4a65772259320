// Periods reduced to zero amplitude with the exact law, and the fit T = T0(1 + Bθ0² + Cθ0⁴).
import { periodRatio } from './elliptic.ts';
import { linearFit } from './least-squares.ts';
import { median, robustSigma } from './stats.ts';

/** Mean of the reduced periods after clipping gross outliers (> 10 robust σ from the median). */
export function robustMean(xs: ArrayLike<number>): { mean: number; used: number; clipped: number } {
  const med = median(xs);
  const sig = robustSigma(xs);
  const lim = 10 * Math.max(sig, Math.abs(med) * 1e-9);
  let s = 0;
  let used = 0;
  let clipped = 0;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i]!;
    if (!Number.isFinite(v)) continue;
    if (Math.abs(v - med) > lim) {
      clipped++;
      continue;
    }
    s += v;
    used++;
  }
  return { mean: used ? s / used : NaN, used, clipped };
}

/** Reduces periods P to zero amplitude: P/(2K(sin²(θ/2))/π); NaN where the amplitude is unknown. */
export function reducePeriods(periods: ArrayLike<number>, amplitudes: ArrayLike<number>, scale = 1): Float64Array {
  const out = new Float64Array(periods.length);
  for (let i = 0; i < periods.length; i++) out[i] = periods[i]! / periodRatio(amplitudes[i]! * scale);
  return out;
}

/** The amplitude-law fit and the comparison values. */
export interface PeriodLawFit {
  readonly T0: number;
  readonly B: number;
  readonly B_u: number;
  /** Null when the amplitudes stay below `C_MIN_AMPLITUDE` (θ⁴ is then not separable from θ²). */
  readonly C: number | null;
  readonly C_u: number | null;
}

/** Largest amplitude (rad) needed before C is fitted: 20°. */
export const C_MIN_AMPLITUDE = (20 * Math.PI) / 180;

/** Fits P = T0 + T0·B·θ² (+ T0·C·θ⁴) to periods P at amplitudes θ (rad); null with < 8 periods or no spread. */
export function fitPeriodLaw(periods: ArrayLike<number>, amplitudes: ArrayLike<number>): PeriodLawFit | null {
  const idx: number[] = [];
  let maxA = 0;
  let minA = Infinity;
  for (let i = 0; i < periods.length; i++) {
    if (Number.isFinite(periods[i]!) && Number.isFinite(amplitudes[i]!)) {
      idx.push(i);
      maxA = Math.max(maxA, amplitudes[i]!);
      minA = Math.min(minA, amplitudes[i]!);
    }
  }
  if (idx.length < 8 || !(maxA * maxA - minA * minA > 1e-6)) return null;
  const withC = maxA >= C_MIN_AMPLITUDE;
  const th2 = (k: number): number => amplitudes[idx[k]!]! ** 2;
  const basis = [() => 1, th2, ...(withC ? [(k: number) => th2(k) ** 2] : [])];
  const fit = linearFit(idx.length, (k) => periods[idx[k]!]!, basis);
  if (!fit) return null;
  const [p0, p1] = fit.params as [number, number];
  const v = fit.cov;
  const B = p1 / p0;
  const B_u = Math.sqrt(Math.max(0, v[1]![1]! - 2 * B * v[0]![1]! + B * B * v[0]![0]!)) / p0;
  if (!withC) return { T0: p0, B, B_u, C: null, C_u: null };
  const p2 = fit.params[2]!;
  const C = p2 / p0;
  const C_u = Math.sqrt(Math.max(0, v[2]![2]! - 2 * C * v[0]![2]! + C * C * v[0]![0]!)) / p0;
  return { T0: p0, B, B_u, C, C_u };
}
