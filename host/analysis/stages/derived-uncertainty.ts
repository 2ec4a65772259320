// Stage: the systematic terms of the figures derived from amplitudes (B, C, amplitudes, Q, gate offset).
//
// Each figure is computed again with the flag width moved by its standard uncertainty (the delay refitted, as the
// analysis would) and with the delay difference moved by its own; the shifts are the figures' systematic terms,
// combined in quadrature with their scatter (GUM, docs/references.md#ref-uncertainty-rounding). The clock moves none
// of them: each is a ratio of times read on the one clock (ω0τ, T0·rate, ω0·ΔT/2). Evaluated on an even subsample of
// ≤ ~4000 periods and passes, plenty for the size of a systematic shift; pure and deterministic.
import type { Rig } from '../../../protocol/rig.ts';
import { fitDamping } from '../damping.ts';
import type { GateDelay } from '../delay-fit.ts';
import { gateOffset, type GateOffset } from '../gate-offset.ts';
import type { SequencedPasses } from '../passes.ts';
import { fitPeriodLaw, type PeriodLawFit } from '../period-law.ts';
import { robustSigma } from '../stats.ts';
import { amplitudeFromTransit, blockHalfAngle } from '../transit-amplitude.ts';
import { fillPeriodAmplitudes } from './amplitudes.ts';
import type { Decay } from './decay.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

const DEG = 180 / Math.PI;

/** One figure's standard uncertainty and its parts (k = 1, the figure's unit). */
export interface FigureU {
  readonly u: number;
  readonly statistics: number;
  readonly flag_width: number;
  readonly delay_difference: number;
}

/** The figures that carry systematic terms (null where the figure itself is null). */
export interface DerivedU {
  readonly B: FigureU | null;
  readonly C: FigureU | null;
  readonly amplitude_start_deg: FigureU | null;
  readonly amplitude_end_deg: FigureU | null;
  readonly median_amplitude_deg: FigureU | null;
  readonly Q: FigureU | null;
  readonly gate_offset_m: FigureU | null;
}

type Figures = Record<keyof DerivedU, number>;

/** What the stage reads. */
export interface DerivedInput {
  readonly rig: Rig | null;
  readonly passes: SequencedPasses;
  readonly periods: Periods;
  readonly reduction: Reduction;
  readonly decay: Decay;
  readonly law: PeriodLawFit | null;
  readonly gate: GateOffset | null;
  readonly delay: GateDelay | null;
  readonly T0: number | null;
}

/** The subsample: every `stride`-th usable period, and every `passStride`-th pass with an amplitude (first, last, median one always). */
interface Sample {
  readonly stride: number;
  readonly passes: number[];
  readonly first: number;
  readonly last: number;
  readonly mid: number;
}

function sampleOf(d: DerivedInput): Sample | null {
  const withAmp: number[] = [];
  for (let c = 0; c < d.reduction.amp.length; c++) if (Number.isFinite(d.reduction.amp[c]!)) withAmp.push(c);
  if (!withAmp.length) return null;
  const ps = Math.max(1, Math.floor(withAmp.length / 4000));
  const med = d.decay.median;
  let mid = withAmp[0]!;
  for (const c of withAmp) if (Math.abs(d.reduction.amp[c]! - med) < Math.abs(d.reduction.amp[mid]! - med)) mid = c;
  return { stride: Math.max(1, Math.floor(d.periods.ends.length / 4000)), passes: withAmp.filter((_, i) => i % ps === 0), first: withAmp[0]!, last: withAmp[withAmp.length - 1]!, mid };
}

/** Every figure with flag width `w` and delay difference `delta`. */
function figuresAt(d: DerivedInput, s: Sample, w: number, delta: number): Figures {
  const { passes: p, periods: per, reduction: red, rig } = d;
  const phiB = blockHalfAngle(w, rig!.length_m);
  const omega0 = (2 * Math.PI) / red.T0mean!;
  const solve = (dl: number) => (c: number) => amplitudeFromTransit(p.transit[c]! + dl, phiB, omega0);
  const amp = new Float64Array(p.t.length).fill(NaN);
  const pAmp = new Float64Array(per.ends.length).fill(NaN);
  const keep = new Uint8Array(per.ends.length);
  for (let k = 0; k < keep.length; k += s.stride) keep[k] = red.keep[k]!;
  fillPeriodAmplitudes(per, p.index, solve(delta), amp, pAmp, s.stride);
  const lawP: number[] = [];
  const lawA: number[] = [];
  for (let k = 0; k < keep.length; k++) if (keep[k]) lawP.push(per.P[k]!), lawA.push(pAmp[k]!);
  const law = fitPeriodLaw(lawP, lawA);
  const one = solve(delta);
  const ts: number[] = [];
  const as: number[] = [];
  const gateAmp = new Float64Array(p.t.length).fill(NaN);
  for (const c of s.passes) {
    const a = one(c);
    ts.push(p.t[c]!), as.push(a), (gateAmp[c] = per.slow[c] ? NaN : a);
  }
  const damping = d.T0 !== null ? fitDamping(ts, as, d.T0, one(s.mid)) : null;
  const gate = gateOffset({ index: p.index, segment: p.segment, t: p.td, amplitude: gateAmp }, omega0, w, rig!.length_m);
  return {
    B: law ? law.B : NaN,
    C: law && law.C !== null ? law.C : NaN,
    amplitude_start_deg: one(s.first) * DEG,
    amplitude_end_deg: one(s.last) * DEG,
    median_amplitude_deg: one(s.mid) * DEG,
    Q: damping ? damping.Q : NaN,
    gate_offset_m: gate ? gate.offset_m : NaN,
  };
}

/** Scatter of one pass's amplitude (rad): second differences in time order remove the decay (var = 6σ²). */
function passScatter(a: readonly number[]): number {
  const d2: number[] = [];
  for (let i = 1; i + 1 < a.length; i++) d2.push(a[i + 1]! - 2 * a[i]! + a[i - 1]!);
  return d2.length > 4 ? robustSigma(d2) / Math.sqrt(6) : NaN;
}

/** The stage: null without a rig, T0 or a calibrated delay. */
export function derivedUncertainty(d: DerivedInput): DerivedU | null {
  const s = d.rig && d.delay && d.reduction.T0mean !== null ? sampleOf(d) : null;
  if (!s || !d.rig || !d.delay) return null;
  const w = d.rig.flag_width_m;
  const dl = d.delay;
  const base = figuresAt(d, s, w, dl.difference_s);
  const byDelay = figuresAt(d, s, w, dl.difference_s + dl.statistical_u_s);
  // A wider flag moves the fitted delay with it (gate-delay.ts), and both move the amplitudes.
  const byWidth = figuresAt(d, s, w + d.rig.flag_width_u_m, dl.difference_s + dl.width_shift_s);
  const aU = passScatter(d.decay.amplitude) * DEG;
  const stat: Figures = {
    B: d.law ? d.law.B_u : NaN,
    C: d.law && d.law.C_u !== null ? d.law.C_u : NaN,
    amplitude_start_deg: aU,
    amplitude_end_deg: aU,
    median_amplitude_deg: (1.25 * aU) / Math.sqrt(Math.max(1, d.decay.amplitude.length)),
    Q: d.decay.Q_u ?? NaN,
    gate_offset_m: d.gate ? d.gate.offset_u_m : NaN,
  };
  const has: Record<keyof DerivedU, boolean> = {
    B: d.law !== null,
    C: d.law !== null && d.law.C !== null,
    amplitude_start_deg: true,
    amplitude_end_deg: true,
    median_amplitude_deg: true,
    Q: d.decay.damping !== null,
    gate_offset_m: d.gate !== null,
  };
  const out = {} as Record<keyof DerivedU, FigureU | null>;
  for (const k of Object.keys(has) as (keyof DerivedU)[]) {
    const term = (a: number, b: number): number => (Number.isFinite(a) && Number.isFinite(b) ? Math.abs(a - b) : 0);
    const parts = { statistics: Number.isFinite(stat[k]) ? stat[k] : 0, flag_width: term(byWidth[k], base[k]), delay_difference: term(byDelay[k], base[k]) };
    out[k] = has[k] ? { u: Math.hypot(parts.statistics, parts.flag_width, parts.delay_difference), ...parts } : null;
  }
  return out;
}
