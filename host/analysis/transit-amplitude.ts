// Amplitude from transit time, exactly: the time a pendulum's flag blocks a beam at the bottom of its swing.
//
// Energy conservation (any rigid pendulum, ω0 = 2π/T0 from the measured small-amplitude period) gives
// θ'² = 2ω0²(cos θ − cos θ0). The beam is blocked while |L sin θ| < w/2, i.e. |θ| < φb = asin(w/2L), so
//   τ = 2∫₀^φb dθ/θ' = (2/ω0)·∫₀^a dx/√((1−x²)(k²−x²)),  a = sin(φb/2), k = sin(θ0/2)   (x = sin(θ/2))
//     = (2/ω0)·F(asin(a/k) | k²) = (2/ω0)·s·R_F(1 − s², 1 − a², 1),  s = a/k           (DLMF 19.25.5)
// We solve that for s (hence θ0) by Newton's method, starting from the harmonic-bottom closed form
// sin(θ0/2) = φb/(2 sin(ω0τ/2)), which is already good to 1e-6 at 1° and 1e-9 at 30°.
import { carlsonRF } from './elliptic.ts';

/** Half-angle of the blocked arc: the flag (width w) at radius L blocks the beam for |θ| < asin(w/2L). */
export function blockHalfAngle(widthM: number, lengthM: number): number {
  return Math.asin(Math.min(1, widthM / (2 * lengthM)));
}

/** G(s) = ω0τ/2 as a function of s = a/k; increasing on (0, 1]. */
function g(s: number, oneMinusA2: number): number {
  return s * carlsonRF(1 - s * s, oneMinusA2, 1);
}

/** Exact transit time (s) of a swing of amplitude θ0 through a beam of half-angle φb, for a pendulum of ω0 (rad/s). */
export function transitTime(theta0: number, phiB: number, omega0: number): number {
  if (!(Math.abs(theta0) > phiB)) return Infinity;
  const a = Math.sin(0.5 * phiB);
  const s = a / Math.sin(0.5 * Math.abs(theta0));
  return (2 / omega0) * g(s, 1 - a * a);
}

/** The harmonic-bottom closed form sin(θ0/2) = φb/(2 sin(ω0τ/2)) (docs/references.md#ref-transit-amplitude); NaN when it has no solution. */
export function harmonicAmplitude(transitS: number, phiB: number, omega0: number): number {
  const x = omega0 * transitS * 0.5;
  const k = x < Math.PI / 2 ? phiB / (2 * Math.sin(x)) : NaN;
  return k > 0 && k <= 1 ? 2 * Math.asin(k) : NaN;
}

/** The naive amplitude from v = w/τ at the bottom: 2ω0 sin(θ0/2)·L = w/τ. Biased low at small amplitude. */
export function naiveAmplitude(transitS: number, phiB: number, omega0: number): number {
  const k = (2 * Math.sin(phiB)) / (2 * omega0 * transitS);
  return k <= 1 ? 2 * Math.asin(k) : NaN;
}

/** Slope of the harmonic form asin(cc·x) (a module-level function: hot, and closures cost a name helper each call). */
function chordSlope(x: number, cc: number, oneMinusA2: number): number {
  const cx = cc * x;
  if (cx < 0.999) return cc / Math.sqrt(1 - cx * cx);
  const h = 1e-7 * Math.min(x, 1 - x);
  return (g(x + h, oneMinusA2) - g(x - h, oneMinusA2)) / (2 * h);
}

/**
 * Amplitude θ0 (radians) from a transit time τ (s), solving the exact integral; NaN when no amplitude gives τ
 * (τ ≤ 0, or τ longer than the transit of a swing that just clears the beam).
 */
export function amplitudeFromTransit(transitS: number, phiB: number, omega0: number): number {
  if (!(transitS > 0) || !(phiB > 0) || !(omega0 > 0)) return NaN;
  const a = Math.sin(0.5 * phiB);
  const c = 1 - a * a;
  const target = 0.5 * omega0 * transitS;
  if (target >= g(1, c)) return NaN;
  // Start: the harmonic form gives s ≈ sin(ω0τ/2)·(a/(φb/2)); clamp into (0, 1).
  let s = Math.min(1 - 1e-12, Math.max(1e-300, (Math.sin(Math.min(target, Math.PI / 2)) * a) / (0.5 * phiB)));
  // Chord Newton with the slope of the harmonic form G_h(s) = asin(c·s), c = (φb/2)/a, which differs from the
  // true slope by O(φb²) (~1e-4 relative): each step gains ~4 digits from a start already within ~1e-6, so one or
  // two evaluations of G reach ~1e-14. Near s = 1 (a swing that barely clears the beam) a numeric slope is used.
  const cc = (0.5 * phiB) / a;
  for (let i = 0; i < 60; i++) {
    const step = (g(s, c) - target) / chordSlope(s, cc, c);
    let next = s - step;
    if (!(next > 0)) next = 0.5 * s;
    if (!(next < 1)) next = 0.5 * (1 + s);
    const moved = Math.abs(next - s);
    s = next;
    // The error left after a step is about |step| times the slope's relative error (≤ 1e-3 here).
    if (moved <= 1e-10 * s) break;
  }
  const k = a / s;
  return k <= 1 ? 2 * Math.asin(k) : NaN;
}

/** Sensitivities of θ0 at one operating point: to the flag width (rad per metre) and to the transit time (rad per second). */
export interface AmplitudeSensitivity {
  readonly dTheta_dWidth_rad_per_m: number;
  readonly dTheta_dTransit_rad_per_s: number;
}

/**
 * Partial derivatives of θ0 w.r.t. w and τ by central differences of the exact inverse. A difference Δ between the
 * sensor's blocking and unblocking delays lengthens every measured τ by −Δ, so dθ0/dΔ = −dθ0/dτ.
 */
export function amplitudeSensitivity(transitS: number, widthM: number, lengthM: number, omega0: number): AmplitudeSensitivity {
  const th = (w: number, t: number): number => amplitudeFromTransit(t, blockHalfAngle(w, lengthM), omega0);
  const hw = widthM * 1e-5;
  const ht = transitS * 1e-5;
  return {
    dTheta_dWidth_rad_per_m: (th(widthM + hw, transitS) - th(widthM - hw, transitS)) / (2 * hw),
    dTheta_dTransit_rad_per_s: (th(widthM, transitS + ht) - th(widthM, transitS - ht)) / (2 * ht),
  };
}
