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
import { WARN, type GateSide, type Warning } from '../warning.ts';

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
  /** What the gate offset's sign is relative to (null: the run joined mid-swing). */
  readonly gateSide: GateSide;
}

/** Valid passes that are not slow yet have no amplitude: with the right w and L there are none. */
function fastWithoutAmplitude(w: WarningInput): number {
  const { passes: p, periods: per, reduction: red } = w;
  let n = 0;
  for (let c = 0; c < p.t.length; c++) if (p.index[c]! >= 0 && !per.slow[c] && !Number.isFinite(red.amp[c]!)) n++;
  return n;
}

function passWarnings(w: WarningInput): Warning[] {
  const { rig, periods: per, reduction: red, T0 } = w;
  const out: Warning[] = [];
  if (per.slowCount > 0) out.push({ kind: 'passes-slow', count: per.slowCount });
  if (red.T0mean !== null && !rig) out.push({ kind: 'no-rig' });
  if (red.clipped > 0) out.push({ kind: 'periods-clipped', count: red.clipped });
  if (T0 === null) out.push({ kind: per.validCount === 0 ? 'no-valid-passes' : 'no-full-period' });
  const withAmp = w.decay.amplitude.length;
  if (rig && T0 !== null && per.validCount > 0 && withAmp < per.validCount)
    out.push({ kind: 'passes-without-amplitude', count: per.validCount - withAmp, well_clear: fastWithoutAmplitude(w) });
  return out;
}

/** Passes with an amplitude a damping fit needs. */
const DAMPING_MIN_PASSES = 40;

/** Why there is no damping fit: too few amplitudes, or (with enough) no measurable decay, with the Q it rules out. */
function noDampingWarning(t: readonly number[], a: readonly number[], T0: number): Warning {
  const bound = a.length >= DAMPING_MIN_PASSES ? decayBound(t, a, T0) : null;
  if (!bound) return { kind: 'damping-too-few', count: a.length, needed: DAMPING_MIN_PASSES };
  const deg = (x: number): number => (x * 180) / Math.PI;
  return { kind: 'no-measurable-decay', amplitude_min_deg: deg(bound.aMin), amplitude_max_deg: deg(bound.aMax), q_lower: Number.isFinite(bound.qLower) ? bound.qLower : null };
}

function gateWarnings(w: WarningInput): Warning[] {
  const { gate } = w;
  if (!gate) return [];
  const out: Warning[] = [];
  if (gate.alignedSegments > 0) out.push({ kind: 'gate-segments-aligned', segments: gate.alignedSegments });
  const x = Math.abs(gate.offset_m);
  if (x > WARN.gateOffset_m && x > 2 * gate.offset_u_m) out.push({ kind: 'gate-offset', offset_m: gate.offset_m, u_m: gate.offset_u_m, side: w.gateSide });
  return out;
}

function fitWarnings(w: WarningInput): Warning[] {
  const { rig, T0, law } = w;
  const out: Warning[] = [];
  if (T0 !== null && rig && !w.decay.damping) out.push(noDampingWarning(w.decay.t, w.decay.amplitude, T0));
  if (T0 !== null && rig && !law) out.push({ kind: 'period-law-unfit' });
  else if (law && law.C === null) out.push({ kind: 'c-held' });
  return [...out, ...gateWarnings(w)];
}

function gravityWarnings(w: WarningInput): Warning[] {
  const { rig, clock } = w;
  const { g } = w.corrected;
  const gU = w.budget.g_u;
  const out: Warning[] = [];
  if (rig && rig.latitude_deg !== undefined && rig.elevation_m === undefined) out.push({ kind: 'no-elevation' });
  if (clock.source === 'nominal' && g !== null) out.push({ kind: 'clock-nominal', u_ppm: clock.u_ppm });
  const clockRow = w.budget.rows.find((b) => b.id === 'clock');
  if (clock.measured && clockRow && gU !== null && g !== null && clockRow.u_rel_g > WARN.clockShareOfU * (gU / g))
    out.push({ kind: 'clock-not-negligible', u_rel_clock: clockRow.u_rel_g, u_rel_g: gU / g });
  return out;
}

/** The warnings stage. */
export function analysisWarnings(w: WarningInput): Warning[] {
  return [...passWarnings(w), ...fitWarnings(w), ...gravityWarnings(w)];
}
