// One pass through two crossed beams: the swing's azimuth, speed and signed minor axis from the two transit
// times and the time between the two mid-crossings (derivation: docs/two-beam-geometry.md).
//
// Near its closest approach to the rest point the bob follows the harmonic ellipse
//   p(τ) = a sin(ω0τ) u − b cos(ω0τ) w,   u = (cos ψ, sin ψ), w = (−sin ψ, cos ψ),
// so its velocity there is a·ω0 along u and it goes round counterclockwise from above when b > 0. Beam k (normal
// at α_k) sees n_k·p = R_k sin(ω0τ − φ_k) with R_k² = a²c_k² + b²s_k², c_k = cos(α_k − ψ), s_k = sin(α_k − ψ),
// tan φ_k = (b/a) tan(α_k − ψ): it is blocked for t_k = (2/ω0) asin(h/R_k), centred on τ_k = φ_k/ω0.
// h is the flag's half-width as an arc, L·asin(w/2L): with it a square crossing is the exact planar transit
// to ~1e-6 at any amplitude (host/analysis/transit-amplitude.ts). A last refinement replaces the harmonic window by
// the exact planar transit along the track.
import { transitTime } from './transit-amplitude.ts';

export interface TwoBeamGeometry {
  /** Directions of the two beams' normals (rad, counterclockwise from above from the reference direction). */
  readonly angleA: number;
  readonly angleB: number;
  /** The flag's width (for a sphere, its diameter), m. */
  readonly flagWidth: number;
  readonly length: number;
  /** Small-swing angular frequency, 2π/T0 (rad/s). */
  readonly omega0: number;
}

/** The ellipse at one closest approach. */
export interface PlaneEllipse {
  /** Direction of the velocity at closest approach, rad. */
  readonly azimuth: number;
  /** Semi-major axis (m): the speed there over ω0. */
  readonly a: number;
  /** Signed semi-minor axis (m): + counterclockwise from above. */
  readonly b: number;
}

/** What each beam saw of one pass: how long it was blocked, and its mid-crossing time (s, any common origin). */
export interface BeamTimes {
  readonly transit: number;
  readonly mid: number;
}

export type PassFix =
  | ({ readonly ok: true; readonly flagged: false } & PlaneEllipse)
  | { readonly ok: false; readonly flagged: true; readonly azimuth: number; readonly reason: string };

/** Passes whose axis is closer than this to a beam line are flagged, not measured (one beam sees them nearly end-on). */
export const BEAM_LINE_MARGIN_RAD = (20 * Math.PI) / 180;

const arcHalfWidth = (g: TwoBeamGeometry): number => g.length * Math.asin(Math.min(1, g.flagWidth / (2 * g.length)));

/** The two beams' times for an ellipse (the forward model; τ = 0 at closest approach). NaN transit: the beam is never blocked. */
export function beamTimes(e: PlaneEllipse, g: TwoBeamGeometry): { A: BeamTimes; B: BeamTimes } {
  const h = arcHalfWidth(g);
  const one = (alpha: number): BeamTimes => {
    const d = alpha - e.azimuth;
    const R = Math.hypot(e.a * Math.cos(d), e.b * Math.sin(d));
    return { transit: R > h ? (2 / g.omega0) * Math.asin(h / R) : NaN, mid: Math.atan2(e.b * Math.sin(d), e.a * Math.cos(d)) / g.omega0 };
  };
  const fold = (t: BeamTimes): BeamTimes => ({ transit: t.transit, mid: Math.atan(Math.tan(t.mid * g.omega0)) / g.omega0 });
  return { A: fold(one(g.angleA)), B: fold(one(g.angleB)) };
}

/**
 * The axis ψ (mod π) between the beam lines where both normals are within 90° (so cos(α_A − ψ), cos(α_B − ψ) > 0),
 * from the ratio ρ = cos(α_A − ψ)/cos(α_B − ψ).
 */
function axisFromRatio(rho: number, g: TwoBeamGeometry): number {
  const p = Math.cos(g.angleA) - rho * Math.cos(g.angleB);
  const q = Math.sin(g.angleA) - rho * Math.sin(g.angleB);
  // cos ψ·p + sin ψ·q = 0.
  let psi = Math.atan2(-p, q);
  if (Math.cos(g.angleA - psi) < 0) psi += Math.PI;
  return Math.atan2(Math.sin(psi), Math.cos(psi));
}

/** b from the mid-crossing difference ω0(τ_A − τ_B) = atan((b/a) tan(α_A − ψ)) − atan((b/a) tan(α_B − ψ)), increasing in b. */
function minorFromMids(x: number, a: number, psi: number, g: TwoBeamGeometry): number {
  const tA = Math.tan(g.angleA - psi);
  const tB = Math.tan(g.angleB - psi);
  const f = (b: number): number => Math.atan((b / a) * tA) - Math.atan((b / a) * tB) - x;
  const df = (b: number): number => tA / a / (1 + ((b * tA) / a) ** 2) - tB / a / (1 + ((b * tB) / a) ** 2);
  let b = (x * a) / (tA - tB);
  for (let i = 0; i < 50; i++) {
    const step = f(b) / df(b);
    b -= step;
    if (Math.abs(step) <= 1e-15 * a) break;
  }
  return b;
}

/** Distance (rad) from the axis ψ to the nearest beam line. */
export function beamLineDistance(psi: number, g: TwoBeamGeometry): number {
  const d = (alpha: number): number => Math.abs(Math.cos(alpha - psi));
  // The angle between the axis and a beam line is asin|cos(α − ψ)|.
  return Math.asin(Math.min(1, d(g.angleA), d(g.angleB)));
}

/**
 * Inverts one pass: the ellipse whose forward model gives the measured transits and mid-crossing difference.
 * Fixed point on (ψ, a) from the transits given b, and b from the mids given (ψ, a); b ≪ a converges in a few rounds.
 */
export function solvePass(A: BeamTimes, B: BeamTimes, g: TwoBeamGeometry): PassFix {
  const h = arcHalfWidth(g);
  const xA = (g.omega0 * A.transit) / 2;
  const xB = (g.omega0 * B.transit) / 2;
  if (!(xA > 0 && xA < Math.PI / 2 && xB > 0 && xB < Math.PI / 2)) return { ok: false, flagged: true, azimuth: NaN, reason: 'a transit too long for any swing' };
  const RA = h / Math.sin(xA);
  const RB = h / Math.sin(xB);
  const x = g.omega0 * (A.mid - B.mid);
  let b = 0;
  let psi = 0;
  let a = 0;
  for (let i = 0; i < 30; i++) {
    const sA = Math.sin(g.angleA - psi);
    const sB = Math.sin(g.angleB - psi);
    const PA = Math.sqrt(Math.max(0, RA * RA - b * b * sA * sA));
    const PB = Math.sqrt(Math.max(0, RB * RB - b * b * sB * sB));
    const next = axisFromRatio(PA / PB, g);
    a = PA / Math.cos(g.angleA - next);
    const bNext = minorFromMids(x, a, next, g);
    const done = Math.abs(next - psi) < 1e-13 && Math.abs(bNext - b) < 1e-13 * a;
    psi = next;
    b = bNext;
    if (done) break;
  }
  if (beamLineDistance(psi, g) < BEAM_LINE_MARGIN_RAD) return { ok: false, flagged: true, azimuth: psi, reason: 'axis within 20° of a beam line' };
  return { ok: true, flagged: false, ...exactAlongTrack(A.transit, B.transit, { azimuth: psi, a, b }, g) };
}

/**
 * Beam k's transit of the exact planar swing of amplitude θ0 along ψ, the beam's half-width seen along the track
 * being h/c_k' (c_k'² = c_k² + (b/a)²s_k² carries the small minor axis as in the harmonic model).
 */
function obliqueTransit(theta0: number, psi: number, bOverA: number, alpha: number, g: TwoBeamGeometry): number {
  const c = Math.hypot(Math.cos(alpha - psi), bOverA * Math.sin(alpha - psi));
  const half = g.flagWidth / 2 / c;
  return half < g.length ? transitTime(theta0, Math.asin(half / g.length), g.omega0) : NaN;
}

/**
 * Refines (ψ, a) so that the exact planar transit (elliptic integral, as for one beam) reproduces both transits:
 * the harmonic window is off by ~1e-5 of the speed at a slant, which would leak into the azimuth's rate. Newton in
 * (ψ, θ0) with a numerical Jacobian, from the harmonic solution.
 */
function exactAlongTrack(tA: number, tB: number, start: PlaneEllipse, g: TwoBeamGeometry): PlaneEllipse {
  const bOverA = start.b / start.a;
  let psi = start.azimuth;
  let th = 2 * Math.asin(Math.min(1, start.a / (2 * g.length)));
  const F = (p: number, t: number): [number, number] => [obliqueTransit(t, p, bOverA, g.angleA, g) / tA - 1, obliqueTransit(t, p, bOverA, g.angleB, g) / tB - 1];
  for (let i = 0; i < 8; i++) {
    const [f1, f2] = F(psi, th);
    const dp = 1e-7;
    const dt = 1e-7 * th;
    const [p1, p2] = F(psi + dp, th);
    const [t1, t2] = F(psi, th + dt);
    const j11 = (p1 - f1) / dp;
    const j21 = (p2 - f2) / dp;
    const j12 = (t1 - f1) / dt;
    const j22 = (t2 - f2) / dt;
    const det = j11 * j22 - j12 * j21;
    if (!Number.isFinite(det) || det === 0) return start;
    const sp = (f1 * j22 - f2 * j12) / det;
    const st = (j11 * f2 - j21 * f1) / det;
    psi -= sp;
    th -= st;
    if (Math.abs(sp) < 1e-14 && Math.abs(st) < 1e-14 * th) break;
  }
  if (!Number.isFinite(psi) || !Number.isFinite(th)) return start;
  const a = 2 * g.length * Math.sin(th / 2);
  return { azimuth: psi, a, b: bOverA * a };
}

/** The axis folded into the measured sector: a direction and its opposite are the same axis. */
export function foldAxis(direction: number, g: TwoBeamGeometry): number {
  let psi = Math.atan2(Math.sin(direction), Math.cos(direction));
  if (Math.cos(g.angleA - psi) < 0) psi = psi > 0 ? psi - Math.PI : psi + Math.PI;
  return psi;
}
