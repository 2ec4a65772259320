// Stage: the decay of the swing, amplitude against time, and the damping fitted to it (damping.ts).
import { fitDamping, type DampingResult } from '../damping.ts';
import { decayBound, type DecayBound } from '../decay-bound.ts';
import type { SequencedPasses } from '../passes.ts';
import { batchMeansStdError, median } from '../stats.ts';

/** Amplitudes in time order, their median, and the damping fit with the scatter of Q. */
export interface Decay {
  /** Pass times (s) and amplitudes (rad) of the passes that have an amplitude. */
  readonly t: number[];
  readonly amplitude: number[];
  /** Median amplitude (rad; NaN without amplitudes). */
  readonly median: number;
  readonly damping: DampingResult | null;
  /** Standard uncertainty of Q from the scatter of the windows' Q, scaled to the fitted Q (null with < 3 windows). */
  readonly Q_u: number | null;
  /** The run's bound on Q when it shows no measurable decay (then `damping` is null); null otherwise. */
  readonly bound: DecayBound | null;
}

/** The decay stage; T0 (s) converts the loss rate to Q. */
export function decayOf(p: SequencedPasses, amp: ArrayLike<number>, T0: number | null): Decay {
  const t: number[] = [];
  const amplitude: number[] = [];
  for (let c = 0; c < p.t.length; c++) if (Number.isFinite(amp[c]!)) t.push(p.t[c]!), amplitude.push(amp[c]!);
  const med = amplitude.length ? median(amplitude) : NaN;
  // A fit to amplitudes that do not fall gives a Q of noise (10⁶ … 10¹⁸ on an undamped run): the bound instead.
  const bound = T0 !== null && amplitude.length >= 40 ? decayBound(t, amplitude, T0) : null;
  const damping = T0 !== null && amplitude.length && (!bound || bound.measurable) ? fitDamping(t, amplitude, T0, med) : null;
  let Q_u: number | null = null;
  if (damping && T0 !== null) {
    const qs = damping.windows.map((w) => (Math.PI * w.amplitude) / (T0 * w.rate)).filter((x) => Number.isFinite(x) && x > 0);
    Q_u = qs.length > 2 ? batchMeansStdError(qs) * (damping.Q / Math.max(median(qs), 1e-300)) : null;
  }
  return { t, amplitude, median: med, damping, Q_u, bound: damping ? null : bound };
}
