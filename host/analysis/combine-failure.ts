// Why `combine` cannot combine these journals, as data: the kind and the files, keys and figures involved, never
// words. The one line the user reads (rig keys to fix, what to time next) is host/output/combine-words.ts.

/** Rig keys that say which bob and string hang there; every length must have the same. */
export const BOB_KEYS = ['bob_diameter_m', 'bob_mass_kg', 'bob_density_kg_m3', 'string_mass_kg', 'flag_width_m'] as const;
export type BobKey = (typeof BOB_KEYS)[number];

/** A tuning series' own refusals (host/analysis/tuning-series.ts). */
export type TuningFailure =
  | { readonly kind: 'tuning-too-few-points' }
  | { readonly kind: 'tuning-no-crossing' };

export type CombineFailure =
  | TuningFailure
  | { readonly kind: 'too-few-journals'; readonly count: number }
  | { readonly kind: 'too-few-passes'; readonly file: string; readonly passes: number }
  | { readonly kind: 'mixed-pendulums'; readonly ordinary: string; readonly reversible: string }
  // Two lengths
  | { readonly kind: 'different-bobs'; readonly first: string; readonly other: string; readonly key: BobKey; readonly values: readonly [number | undefined, number | undefined] }
  | { readonly kind: 'one-length'; readonly length_m: number }
  | { readonly kind: 'no-length-step'; readonly file: string }
  | { readonly kind: 'two-length-fit-failed' }
  | { readonly kind: 'no-period-at-length'; readonly file: string; readonly length_m: number }
  // Reversible pendulum
  | {
      readonly kind: 'different-bars';
      readonly first: string;
      readonly other: string;
      readonly edge_distance_m: readonly [number, number];
      readonly flag_width_m: readonly [number, number];
    }
  /** Every journal about one pivot: `missing` is the other. */
  | { readonly kind: 'one-pivot'; readonly missing: 1 | 2 }
  | { readonly kind: 'mass-position-missing'; readonly file: string }
  | { readonly kind: 'pivot-cm-distances-differ'; readonly pivot: 1 | 2; readonly values: readonly number[] }
  | { readonly kind: 'bessel-no-solution'; readonly h1_m: number; readonly h2_m: number }
  | { readonly kind: 'tuning-too-few-positions'; readonly pivot: 1 | 2; readonly positions: number };

export type CombineFailureKind = CombineFailure['kind'];
