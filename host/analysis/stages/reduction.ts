// Stage: the reduction to zero amplitude. Amplitudes need ω0 = 2π/T0 and T0 needs the amplitudes: a fixed point.
import type { Rig } from '../../../protocol/rig.ts';
import { periodRatio } from '../elliptic.ts';
import { clipMask, maskedMean, reducePeriods } from '../period-law.ts';
import type { SequencedPasses } from '../passes.ts';
import { everyKth, median } from '../stats.ts';
import { blockHalfAngle } from '../transit-amplitude.ts';
import { fillPeriodAmplitudes, transitSolver } from './amplitudes.ts';
import type { Periods } from './periods.ts';

/** The periods reduced to zero amplitude, and the amplitudes they were reduced with. */
export interface Reduction {
  /** Mean of the kept reduced periods (s); null without a period. Without a rig: the mean of the raw periods. */
  readonly T0mean: number | null;
  /** Amplitude of every pass (rad; NaN when unknown: no rig, not valid, or no solution). */
  readonly amp: Float64Array;
  /** Amplitude of every usable period (rad), parallel to `Periods.P`. */
  readonly pAmp: Float64Array;
  /** The periods reduced to zero amplitude (the raw periods without a rig), and which of them are kept. */
  readonly P0: Float64Array;
  readonly keep: Uint8Array;
  /** Periods left out as gross outliers. */
  readonly clipped: number;
  /** The block half-angle φb = asin(w/2L) (NaN without a rig). */
  readonly phiB: number;
}

/**
 * The fixed point converges by a factor of about −θ0²/24 per round (−0.15 at 60°). It is iterated to convergence
 * on a subsample of ≤ ~2000 periods first (the outlier mask from the second round on: the first T0 guess is the raw
 * median period); returns that T0.
 */
function subsampleFixedPoint(p: SequencedPasses, per: Periods, solve: (t0: number) => (c: number) => number, amp: Float64Array, pAmp: Float64Array, t0: number): number {
  const stride = Math.max(1, Math.floor(per.ends.length / 2000));
  let subKeep: Uint8Array | null = null;
  let T0 = t0;
  for (let iter = 0; iter < 60; iter++) {
    fillPeriodAmplitudes(per, p.index, solve(T0), amp, pAmp, stride);
    const sub: number[] = [];
    for (let k = 0; k < per.ends.length; k += stride) sub.push(per.P[k]! / periodRatio(pAmp[k]!));
    if (iter <= 1) subKeep = clipMask(sub).keep;
    const t1 = maskedMean(sub, subKeep!);
    if (!Number.isFinite(t1)) break;
    const moved = Math.abs(t1 - T0) / T0;
    T0 = t1;
    if (moved < 1e-12) break;
  }
  return T0;
}

/** The reduction stage: amplitudes of every pass (solved from transit + `delta`, the on/off delay difference), reduced periods and their mean. */
export function reduceToZeroAmplitude(p: SequencedPasses, per: Periods, rig: Rig | null, delta = 0): Reduction {
  const n = p.t.length;
  const amp = new Float64Array(n).fill(NaN);
  const pAmp = new Float64Array(per.ends.length).fill(NaN);
  const phiB = rig ? blockHalfAngle(rig.flag_width_m, rig.length_m) : NaN;
  if (per.P.length === 0) return { T0mean: null, amp, pAmp, P0: per.P, keep: new Uint8Array(0), clipped: 0, phiB };
  if (!rig) {
    const cm = clipMask(per.P);
    return { T0mean: maskedMean(per.P, cm.keep), amp, pAmp, P0: per.P, keep: cm.keep, clipped: cm.clipped, phiB };
  }
  const solve = (t0: number): ((c: number) => number) => transitSolver(p.transit, phiB, (2 * Math.PI) / t0, delta);
  let T0 = subsampleFixedPoint(p, per, solve, amp, pAmp, median(everyKth(per.P, 4000)));
  // Then every amplitude, repeated on all periods only while T0 still moves: a relative change ε of ω0 moves the
  // amplitudes by ~ε and T0 back by ~ε·θ²/8, so stop when that is < 1e-10.
  let P0 = per.P;
  let keep: Uint8Array = new Uint8Array(per.P.length).fill(1);
  let clipped = 0;
  for (let iter = 0; iter < 5; iter++) {
    fillPeriodAmplitudes(per, p.index, solve(T0), amp, pAmp);
    P0 = reducePeriods(per.P, pAmp);
    const cm = clipMask(P0);
    keep = cm.keep;
    clipped = cm.clipped;
    const t2 = maskedMean(P0, keep);
    if (!Number.isFinite(t2)) break;
    const moved = Math.abs(t2 - T0) / T0;
    T0 = t2;
    let maxA = 0;
    for (let k = 0; k < pAmp.length; k++) if (pAmp[k]! > maxA) maxA = pAmp[k]!;
    if ((moved * maxA * maxA) / 8 < 1e-10) break;
  }
  return { T0mean: T0, amp, pAmp, P0, keep, clipped, phiB };
}
