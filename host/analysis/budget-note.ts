// What a budget row or a correction line says beside its figure, as data: the input's value and standard
// uncertainty in SI units, counts, and where the input came from. Never words and never rounded here: the words,
// the units shown and the one ± rounding rule are host/output/budget-words.ts.
import type { CorrectionId } from './result.ts';

/** Beside a correction line: what it was computed from, or that it was not applied (the row's id says which). */
export type CorrectionNote =
  /** Finite bob: the sphere's radius (m). */
  | { readonly kind: 'bob-radius'; readonly m: number }
  /** String mass: string mass over bob mass. */
  | { readonly kind: 'string-to-bob-mass'; readonly ratio: number }
  /** Air: air density over the bob's density. */
  | { readonly kind: 'air-to-bob-density'; readonly ratio: number }
  /** Damping: the quality factor measured on the run. */
  | { readonly kind: 'q-measured'; readonly q: number }
  /** Not applied for want of a rig key or a measurement: which correction. */
  | { readonly kind: 'not-applied'; readonly correction: CorrectionId };

/** Beside a budget row: the input, its value and standard uncertainty (SI), or its counts. */
export type BudgetNote =
  | CorrectionNote
  /** A length from a scale: L (pivot to bob centre) or l (knife edge to knife edge). */
  | { readonly kind: 'length'; readonly symbol: 'L' | 'l'; readonly m: number; readonly u_m: number }
  | { readonly kind: 'flag-width'; readonly m: number; readonly u_m: number }
  /** The T0 line: passes through it and its noise per pass (white, random walk). */
  | { readonly kind: 't0-line'; readonly passes: number; readonly white_s: number; readonly walk_s: number }
  /** The mean of periods, where there is no line. */
  | { readonly kind: 'periods'; readonly count: number }
  /** The device clock's rate error and its u (ppm, as the result's clock_ppm). */
  | { readonly kind: 'clock-rate'; readonly ppm: number; readonly u_ppm: number }
  /** The sensor's on/off delay difference: fitted from the run, or the assumed prior (host/analysis/delay-fit.ts). */
  | { readonly kind: 'delay-difference'; readonly source: 'run' | 'prior'; readonly s: number; readonly u_s: number }
  /** The length's temperature coefficient (1/K) and the temperature T0 is carried to. */
  | { readonly kind: 'temperature-coefficient'; readonly per_K: number; readonly u_per_K: number; readonly reference_C: number }
  /** The length as measured at one temperature, carried to the reference. */
  | { readonly kind: 'length-carried'; readonly measured_C: number; readonly reference_C: number }
  /** Reversible pendulum: h1 − h2 with its u, and T1 − T2 (how much it matters). */
  | { readonly kind: 'centre-of-mass'; readonly m: number; readonly u_m: number; readonly period_difference_s: number }
  /** A period with its standard uncertainty: T at a tuning series' crossing, T1 and T2 of a pair. */
  | { readonly kind: 'period'; readonly symbol: 'T' | 'T1' | 'T2'; readonly s: number; readonly u_s: number }
  /** One input's u on each pivot's period, the two taken together (same flag and gate). */
  | { readonly kind: 'both-pivots'; readonly pivot1_u_s: number; readonly pivot2_u_s: number }
  /** One input's u on each pivot's period, independent between the pivots (each pivot's own flag radius). */
  | { readonly kind: 'each-pivot'; readonly pivot1_u_s: number; readonly pivot2_u_s: number }
  /** Each pivot's clock calibration (u of its period) and any part common to both (relative). */
  | { readonly kind: 'pivot-clocks'; readonly pivot1_u_s: number; readonly pivot2_u_s: number; readonly common_u_rel: number }
  /** A clock error common to every run (relative). */
  | { readonly kind: 'common-clock'; readonly u_rel: number }
  /** Bessel's difference term: ρ_air·V/M and how far it moves g (relative). */
  | { readonly kind: 'buoyancy-difference'; readonly ratio: number; readonly g_rel: number }
  /** Two lengths: the u of each reading of the scale (m). */
  | { readonly kind: 'scale-reading'; readonly u_m: number }
  | { readonly kind: 'lengths'; readonly count: number }
  /** Two lengths: the corrections' u as a fraction of each, taken together. */
  | { readonly kind: 'correction-fraction'; readonly fraction: number };

export type BudgetNoteKind = BudgetNote['kind'];
