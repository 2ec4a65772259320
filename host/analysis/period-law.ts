// Periods reduced to zero amplitude with the exact law, and the fit T = T0(1 + Bθ0² + Cθ0⁴).
import { periodRatio } from './elliptic.ts';
import { linearFit } from './least-squares.ts';
import { median, robustSigma } from './stats.ts';

/** Marks the values to keep: finite and within max(10 robust σ, 1e-4 of the median) of the median (gross outliers out). */
export function clipMask(xs: ArrayLike<number>): { keep: Uint8Array; clipped: number } {
  // The median and σ of ≤ ~4000 evenly spread values are as good for a 10σ clip, and much cheaper.
  const stride = Math.max(1, Math.floor(xs.length / 4000));
  const sample: number[] = [];
  for (let i = 0; i < xs.length; i += stride) sample.push(xs[i]!);
  const med = median(sample);
  const lim = Math.max(10 * robustSigma(sample), Math.abs(med) * 1e-4);
  const keep = new Uint8Array(xs.length);
  let clipped = 0;
  for (let i = 0; i < xs.length; i++) {
    const v = xs[i]!;
    if (!Number.isFinite(v)) continue;
    if (Math.abs(v - med) > lim) clipped++;
    else keep[i] = 1;
  }
  return { keep, clipped };
}

/** Mean of the kept values. */
export function maskedMean(xs: ArrayLike<number>, keep: Uint8Array): number {
  let s = 0;
  let n = 0;
  for (let i = 0; i < xs.length; i++) if (keep[i]) (s += xs[i]!), n++;
  return n ? s / n : NaN;
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
  /** Null when the amplitudes stay below `C_MIN_AMPLITUDE` (θ⁴ is then not separable from θ²; C is held at 11/3072). */
  readonly C: number | null;
  readonly C_u: number | null;
}

/** Largest amplitude (rad) needed before C is fitted: 20°. */
export const C_MIN_AMPLITUDE = (20 * Math.PI) / 180;

/** The exact law's part beyond θ⁴: 2K(sin²(θ/2))/π − 1 − θ²/16 − 11θ⁴/3072 (173θ⁶/737280 + …). */
export function periodRatioBeyondTheta4(theta: number): number {
  const t2 = theta * theta;
  return periodRatio(theta) - 1 - t2 / 16 - (11 * t2 * t2) / 3072;
}

/**
 * Fits P = T0(1 + Bθ² + Cθ⁴ + R(θ)) to periods P at amplitudes θ (rad), with R the exact law's terms beyond θ⁴
 * held at their simple-pendulum values, so that truncation does not bias C (fitting to 30° without R moves C by
 * about 2 %); a rig that obeys the simple law gives B = 1/16 and C = 11/3072 exactly. C is fitted only from 20°
 * and kept only when determined to better than its own size; null with < 8 periods or when the amplitude range
 * leaves B uncertain by more than 30 %.
 */
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
  const withC = maxA >= C_MIN_AMPLITUDE ? fitWith(periods, amplitudes, idx, true) : null;
  // C is kept only when the data pin it down (better than 100 % of 11/3072); otherwise it is held at the law's value.
  const f = withC && withC.C_u! < 11 / 3072 ? withC : fitWith(periods, amplitudes, idx, false);
  // B is kept only when the amplitude range pins it to better than 30 % of 1/16.
  return f && f.B_u < 0.3 / 16 ? f : null;
}

function fitWith(periods: ArrayLike<number>, amplitudes: ArrayLike<number>, idx: readonly number[], withC: boolean): PeriodLawFit | null {
  // Columns precomputed once: the fit evaluates each basis function three times per row.
  const m = idx.length;
  const y = new Float64Array(m);
  const c0 = new Float64Array(m);
  const c2 = new Float64Array(m);
  const c4 = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    const th = amplitudes[idx[k]!]!;
    y[k] = periods[idx[k]!]!;
    c2[k] = th * th;
    c4[k] = th ** 4;
    c0[k] = 1 + periodRatioBeyondTheta4(th) + (withC ? 0 : (11 / 3072) * c4[k]!);
  }
  const basis = [(k: number) => c0[k]!, (k: number) => c2[k]!, ...(withC ? [(k: number) => c4[k]!] : [])];
  const fit = linearFit(m, (k) => y[k]!, basis);
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
