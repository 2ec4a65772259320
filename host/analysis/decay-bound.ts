// When a run shows no decay the damping cannot be fitted, but the run still bounds it: the steepest exponential
// decay the amplitudes allow gives a lower bound on Q (Q = ω0/(2γ) for A ∝ e^{−γt}; docs/references.md#ref-damping).
import { linearFit } from './least-squares.ts';

export interface DecayBound {
  /** Q at least this (the decay rate at the fitted slope plus two standard uncertainties). */
  readonly qLower: number;
  /** Smallest and largest amplitude seen (rad). */
  readonly aMin: number;
  readonly aMax: number;
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
  return { qLower: gammaMax > 0 ? Math.PI / (T0 * gammaMax) : Infinity, aMin, aMax };
}
