// When a run shows no decay the damping cannot be fitted, but the run still bounds it: the steepest exponential
// decay the amplitudes allow gives a lower bound on Q (Q = ω0/(2γ) for A ∝ e^{−γt}; docs/references.md#ref-damping).
import { linearFit } from './least-squares.ts';

export interface DecayBound {
  /** Q at least this (the decay rate at the fitted slope plus two standard uncertainties). */
  readonly qLower: number;
  /** Smallest and largest amplitude seen (rad). */
  readonly aMin: number;
  readonly aMax: number;
  /**
   * Whether the run shows a decay at all: ln A falls by more than two standard uncertainties of its slope and by
   * more than the amplitudes' numerical resolution (~1e-9 relative) over the run. Without one, a fitted Q is noise.
   */
  readonly measurable: boolean;
}

/** Lower bound on Q from ln A against t (s) of one run; null with fewer than three finite amplitudes. */
export function decayBound(t: ArrayLike<number>, a: ArrayLike<number>, T0: number): DecayBound | null {
  const fit = linearFit(t.length, (i) => (a[i]! > 0 ? Math.log(a[i]!) : NaN), [() => 1, (i) => t[i]!]);
  if (!fit) return null;
  let aMin = Infinity;
  let aMax = -Infinity;
  for (let i = 0; i < a.length; i++) if (a[i]! > 0) (aMin = Math.min(aMin, a[i]!)), (aMax = Math.max(aMax, a[i]!));
  const slope = fit.params[1]!;
  const u = Math.sqrt(fit.cov[1]![1]!);
  const gammaMax = Math.max(-slope, 0) + 2 * u;
  const span = Math.abs(t[t.length - 1]! - t[0]!);
  const measurable = -slope > 2 * u && -slope * span > 1e-9;
  return { qLower: gammaMax > 0 ? Math.PI / (T0 * gammaMax) : Infinity, aMin, aMax, measurable };
}
