// Stage: amplitudes of passes from their transit times (exact solution), and the amplitude of each full period.
import type { Rig } from '../../../protocol/rig.ts';
import type { AmplitudeSensitivityReport } from '../result.ts';
import { amplitudeFromTransit, amplitudeSensitivity } from '../transit-amplitude.ts';
import type { Periods } from './periods.ts';

const DEG = 180 / Math.PI;

/**
 * The amplitude a full period is reduced with: the mean over the period, (θa + 2θm + θb)/4 from its start, middle
 * and end passes (the middle one stands for two quarter-swings), or (θa + θb)/2 when the middle pass is missing.
 */
export function periodAmplitude(amp: ArrayLike<number>, a: number, m: number, b: number): number {
  return m >= 0 ? 0.25 * (amp[a]! + 2 * amp[m]! + amp[b]!) : 0.5 * (amp[a]! + amp[b]!);
}

/** Solver of one pass's amplitude (rad) from its transit time (s): block half-angle φb and ω0 fixed. */
export function transitSolver(transit: ArrayLike<number>, phiB: number, omega0: number, dTransit = 0): (c: number) => number {
  return (c) => amplitudeFromTransit(transit[c]! + dTransit, phiB, omega0);
}

/**
 * Fills the amplitudes of the passes of every `stride`-th usable period (`amp`, per pass) and of those periods
 * (`pAmp`, per usable period). With stride 1 every valid pass (`index` ≥ 0) gets its amplitude, the others NaN.
 */
export function fillPeriodAmplitudes(
  per: Periods,
  index: ArrayLike<number>,
  solve: (c: number) => number,
  amp: Float64Array,
  pAmp: Float64Array,
  stride = 1,
): void {
  if (stride === 1) for (let c = 0; c < amp.length; c++) amp[c] = index[c]! >= 0 ? solve(c) : NaN;
  for (let k = 0; k < per.ends.length; k += stride) {
    const c = per.ends[k]!;
    const a = per.start[c]!;
    const m = per.mid[c]!;
    if (stride > 1) {
      if (a >= 0) amp[a] = solve(a);
      if (m >= 0) amp[m] = solve(m);
      amp[c] = solve(c);
    }
    pAmp[k] = periodAmplitude(amp, a, m, c);
  }
}

/** How the amplitude of the pass nearest the median amplitude moves with the flag width and the on/off delay difference. */
export function sensitivityAtMedian(transit: ArrayLike<number>, amp: ArrayLike<number>, medA: number, rig: Rig | null, omega0: number): AmplitudeSensitivityReport | null {
  if (!rig || !Number.isFinite(medA)) return null;
  let best = -1;
  for (let c = 0; c < amp.length; c++) if (Number.isFinite(amp[c]!) && (best < 0 || Math.abs(amp[c]! - medA) < Math.abs(amp[best]! - medA))) best = c;
  const s = amplitudeSensitivity(transit[best]!, rig.flag_width_m, rig.length_m, omega0);
  return {
    at_amplitude_deg: amp[best]! * DEG,
    per_width_deg_per_mm: (s.dTheta_dWidth_rad_per_m * DEG) / 1000,
    per_delay_difference_deg_per_us: (-s.dTheta_dTransit_rad_per_s * DEG) / 1e6,
  };
}
