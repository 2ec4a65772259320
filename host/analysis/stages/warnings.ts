// Stage: what the analysis warns about, from the outputs of the other stages, in a fixed order.
import type { Rig } from '../../../protocol/rig.ts';
import { decayBound } from '../decay-bound.ts';
import type { GateOffset } from '../gate-offset.ts';
import type { ClockApplied, SequencedPasses } from '../passes.ts';
import type { PeriodLawFit } from '../period-law.ts';
import type { Budget } from './budget.ts';
import type { Corrected } from './corrections.ts';
import type { Decay } from './decay.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

/** The stage outputs the warnings look at. */
export interface WarningInput {
  readonly rig: Rig | null;
  readonly passes: SequencedPasses;
  readonly periods: Periods;
  readonly reduction: Reduction;
  readonly T0: number | null;
  readonly decay: Decay;
  readonly law: PeriodLawFit | null;
  readonly gate: GateOffset | null;
  readonly corrected: Corrected;
  readonly budget: Budget;
  readonly clock: ClockApplied;
}

/** Valid passes that are not slow yet have no amplitude: with the right w and L there are none. */
function fastWithoutAmplitude(w: WarningInput): number {
  const { passes: p, periods: per, reduction: red } = w;
  let n = 0;
  for (let c = 0; c < p.t.length; c++) if (p.index[c]! >= 0 && !per.slow[c] && !Number.isFinite(red.amp[c]!)) n++;
  return n;
}

function passWarnings(w: WarningInput): string[] {
  const { rig, periods: per, reduction: red, T0 } = w;
  const out: string[] = [];
  if (per.slowCount > 0) out.push(`${per.slowCount} pass(es) barely cleared the beam (transit over a third of the half-period): used for amplitudes only`);
  if (red.T0mean !== null && !rig) out.push('no rig description: amplitudes, the reduction to zero amplitude and g are not available (give --rig FILE)');
  if (red.clipped > 0) out.push(`${red.clipped} period(s) far from the rest were left out of the mean of periods`);
  if (T0 === null) out.push(per.validCount === 0 ? 'no valid passes: nothing to analyse' : 'fewer than three passes in a row: no full period yet');
  const withAmp = w.decay.amplitude.length;
  if (rig && T0 !== null && per.validCount > 0 && withAmp < per.validCount) {
    const fastMissing = fastWithoutAmplitude(w);
    out.push(
      `${per.validCount - withAmp} pass(es) had a transit longer than a swing that just clears the beam would give: no amplitude for them` +
        (fastMissing > 0 ? ` (${fastMissing} of them well clear of the beam: check flag_width_m and length_m)` : ' (the swing was dying out)'),
    );
  }
  return out;
}

/** Why there is no damping fit: too few amplitudes, or (with enough) no measurable decay, with the Q it rules out. */
function noDampingWarning(t: readonly number[], a: readonly number[], T0: number): string {
  const bound = a.length >= 40 ? decayBound(t, a, T0) : null;
  if (!bound) return `too few swings to fit the damping (needs ≥ 40 passes with an amplitude, had ${a.length})`;
  const deg = (x: number): string => ((x * 180) / Math.PI).toFixed(2);
  const q = Number.isFinite(bound.qLower) ? `Q > ${bound.qLower.toPrecision(2)} (two standard uncertainties)` : 'Q unbounded';
  return `no measurable decay over the run (amplitude ${deg(bound.aMin)}° to ${deg(bound.aMax)}°): ${q}; a longer run shows the damping`;
}

function fitWarnings(w: WarningInput): string[] {
  const { rig, T0, law, gate } = w;
  const out: string[] = [];
  if (T0 !== null && rig && !w.decay.damping) out.push(noDampingWarning(w.decay.t, w.decay.amplitude, T0));
  if (T0 !== null && rig && !law) out.push('too few periods or too narrow an amplitude range to fit T = T0(1 + Bθ0² + Cθ0⁴) (B would be uncertain by > 30 %)');
  else if (law && law.C === null) out.push('C is held at 11/3072: the amplitudes do not reach 20°, or do not pin C down (θ0⁴ cannot be told from θ0² there)');
  if (gate && gate.alignedSegments > 0) out.push(`gate offset: the side of ${gate.alignedSegments} later segment(s) was matched to the first (passes between segments are not known)`);
  return out;
}

function gravityWarnings(w: WarningInput): string[] {
  const { rig, clock } = w;
  const { g } = w.corrected;
  const gU = w.budget.g_u;
  const out: string[] = [];
  if (rig && rig.latitude_deg !== undefined && rig.elevation_m === undefined) out.push('expected g assumes elevation 0 m (the rig gives no elevation_m)');
  if (clock.source === 'nominal' && g !== null) out.push(`g uses the nominal device clock (±${clock.u_ppm.toFixed(0)} ppm assumed): its uncertainty is dominated by the clock`);
  const clockRow = w.budget.rows.find((b) => b.id === 'clock');
  if (clock.measured && clockRow && gU !== null && g !== null && clockRow.u_rel_g > 0.5 * (gU / g))
    out.push('the clock calibration is too uncertain to be negligible: record longer, or give --clock pps / --clock <ppm>');
  return out;
}

/** The warnings stage. */
export function analysisWarnings(w: WarningInput): string[] {
  return [...passWarnings(w), ...fitWarnings(w), ...gravityWarnings(w)];
}
