// Stage: the gate's on/off delay difference calibrated from the run (delay-fit.ts), the rig's assumed value as a prior.
import type { Warning } from '../warning.ts';
import type { Rig } from '../../../protocol/rig.ts';
import { amplitudeSlopePerTransit, fitDelayDifference, gateDelay, withWidthTerm, type DelayFit, type GateDelay } from '../delay-fit.ts';
import { amplitudeFromTransit, blockHalfAngle } from '../transit-amplitude.ts';
import { fillPeriodAmplitudes } from './amplitudes.ts';
import type { SequencedPasses } from '../passes.ts';
import { periodAmplitude } from './amplitudes.ts';
import type { Periods } from './periods.ts';
import { reduceToZeroAmplitude, type Reduction } from './reduction.ts';

/** The assumed delay difference: 0 ± u (s). */
export interface DelayPrior {
  readonly s: number;
  readonly u: number;
}

/**
 * Fits Δ from periods and amplitudes solved at `delta0` (`amp` per pass, `pAmp` per usable period, `keep` the periods
 * to use), ω0 = 2π/T0 and the block half-angle φb.
 */
export function delayFitAt(p: SequencedPasses, per: Periods, amp: ArrayLike<number>, pAmp: ArrayLike<number>, keep: ArrayLike<number>, phiB: number, omega0: number, delta0: number): DelayFit | null {
  const slope = new Float64Array(p.t.length).fill(NaN);
  for (let c = 0; c < slope.length; c++) if (Number.isFinite(amp[c]!)) slope[c] = amplitudeSlopePerTransit(p.transit[c]! + delta0, phiB, omega0);
  const pSlope = new Float64Array(per.ends.length);
  for (let k = 0; k < pSlope.length; k++) {
    const c = per.ends[k]!;
    pSlope[k] = periodAmplitude(slope, per.start[c]!, per.mid[c]!, c);
  }
  return fitDelayDifference(per.P, pAmp, pSlope, keep, delta0);
}

/** The delay stage on a reduction solved at Δ = `at`: null without a rig or without periods (nothing to calibrate). */
export function calibrateDelay(p: SequencedPasses, per: Periods, red: Reduction, rig: Rig | null, prior: DelayPrior, at: number): GateDelay | null {
  if (!rig || red.T0mean === null) return null;
  return gateDelay(delayFitAt(p, per, red.amp, red.pAmp, red.keep, red.phiB, (2 * Math.PI) / red.T0mean, at), prior.s, prior.u);
}

/**
 * The reduction with the delay calibrated: reduced at the prior, Δ fitted, reduced again at Δ, and Δ refitted there
 * until it stays within a tenth of its uncertainty (the line is exact only at its trial Δ: at 45° a 40 µs
 * difference fitted in one step reads 1.3 µs short).
 */
export function reduceWithDelay(p: SequencedPasses, per: Periods, rig: Rig | null, prior: DelayPrior): { reduction: Reduction; delay: GateDelay | null } {
  let reduction = reduceToZeroAmplitude(p, per, rig, prior.s);
  let at = prior.s;
  let delay = calibrateDelay(p, per, reduction, rig, prior, at);
  for (let i = 0; i < 4 && delay && Math.abs(delay.difference_s - at) > 0.1 * delay.difference_u_s; i++) {
    at = delay.difference_s;
    reduction = reduceToZeroAmplitude(p, per, rig, at);
    delay = calibrateDelay(p, per, reduction, rig, prior, at);
  }
  if (delay && rig && delay.statistical_u_s > 0) {
    const w = rig.flag_width_m;
    delay = withWidthTerm(delay, delayAtWidth(p, per, reduction, rig, prior, w + rig.flag_width_u_m, at) - delayAtWidth(p, per, reduction, rig, prior, w, at));
  }
  return { reduction, delay };
}

/**
 * Δ fitted with flag width `w` on an even subsample of ≤ ~4000 periods (two steps from `at`): the flag width's
 * error is taken by the fit for a delay (both bias the amplitudes), so Δ carries that term.
 */
function delayAtWidth(p: SequencedPasses, per: Periods, red: Reduction, rig: Rig, prior: DelayPrior, w: number, at: number): number {
  const phiB = blockHalfAngle(w, rig.length_m);
  const omega0 = (2 * Math.PI) / red.T0mean!;
  const stride = Math.max(1, Math.floor(per.ends.length / 4000));
  const keep = new Uint8Array(per.ends.length);
  for (let k = 0; k < keep.length; k += stride) keep[k] = red.keep[k]!;
  const amp = new Float64Array(p.t.length).fill(NaN);
  const pAmp = new Float64Array(per.ends.length).fill(NaN);
  let delta = at;
  for (let i = 0; i < 2; i++) {
    const dl = delta;
    fillPeriodAmplitudes(per, p.index, (c) => amplitudeFromTransit(p.transit[c]! + dl, phiB, omega0), amp, pAmp, stride);
    const g = gateDelay(delayFitAt(p, per, amp, pAmp, keep, phiB, omega0, dl), prior.s, prior.u);
    delta = g.difference_s;
  }
  return delta;
}

/** The warning when the run cannot calibrate the delay (its amplitude range is too narrow); words in host/output/warning-words.ts. */
export function delayWarnings(d: GateDelay | null): Warning[] {
  if (!d || d.source === 'run') return [];
  return [{ kind: 'gate-delay-prior', run_s: d.run_u_s !== null ? d.run_s : null, run_u_s: d.run_u_s, prior_s: d.prior_s, prior_u_s: d.prior_u_s }];
}
