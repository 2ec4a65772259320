// Published check values for the complete elliptic integral and the pendulum period law, shared by the
// analysis and simulator tests so each value and its source stand in one place.

/**
 * K(m), parameter m = k²: Abramowitz & Stegun Table 17.1, as reproduced in the GNU Octave ellipke test block
 * "Test against A&S Table 17.1" for m ≤ 0.5; m = 0.7, 0.75, 0.9, 0.99 from A&S Tables 17.1/17.2 recalled from
 * memory and recomputed with mpmath (docs/references.md#ref-elliptic-k).
 */
export const AS_TABLE_17_1_K: readonly (readonly [m: number, K: number])[] = [
  [0, 1.570796326794897],
  [0.05, 1.591003453790792],
  [0.1, 1.612441348720219],
  [0.2, 1.659623598610528],
  [0.25, 1.685750354812596],
  [0.3, 1.713889448178791],
  [0.4, 1.777519371491253],
  [0.5, 1.854074677301372],
  [0.7, 2.075363135292469],
  [0.75, 2.156515647499643],
  [0.9, 2.578092113348173],
  [0.99, 3.695637362989875],
];

/**
 * T/T0 = 2K(sin²(θ0/2))/π at release angle θ0 (degrees), 16 s.f.: docs/references.md#ref-period-ratio (mpmath, five independent
 * methods agreeing to ≥ 14 digits); the 90° value is the A&S / DLMF check value 2K(sin 45°)/π = 1.1803405990.
 */
export const PERIOD_RATIO_TABLE: readonly (readonly [deg: number, ratio: number])[] = [
  [1, 1.000019038921006],
  [4, 1.000304702506088],
  [5, 1.000476172485987],
  [10, 1.001907188143217],
  [15, 1.004300579173465],
  [20, 1.007669025791545],
  [30, 1.017408797595956],
  [45, 1.039973343196804],
  [60, 1.073182007149364],
  [90, 1.180340599016096],
  [120, 1.37288050061835],
  [150, 1.762203729503756],
  [170, 2.439362719673884],
  [179, 3.901065160389086],
];
