// The bob of a spherical pendulum as a stream of events: beam entries and exits per beam, farthest points and
// closest approaches (with the swing's azimuth and signed minor axis there, for the truth file).
import { bracketedRoot, hornerDerivative, horner } from './taylor.ts';
import { project, SphericalSeries, type SphericalOde, type State6 } from './spherical-taylor.ts';

/** A beam seen as a zone: the bob blocks it while lo < n·(x, y) < hi, n = (nx, ny) its horizontal normal. */
export interface BeamZone {
  readonly nx: number;
  readonly ny: number;
  readonly lo: number;
  readonly hi: number;
}

export interface SphericalSetup {
  readonly ode: SphericalOde;
  /** Small-swing angular frequency (sets the longest step). */
  readonly omega0: number;
  readonly start: State6;
  readonly beams: readonly BeamZone[];
}

/** Events in time order, t in seconds since release. */
export type SphereEvent =
  | { readonly kind: 'enter' | 'exit'; readonly t: number; readonly beam: number; readonly dir: 1 | -1 }
  /** Farthest from the rest point: polar angle, signed by the side of the reference direction. */
  | { readonly kind: 'turn'; readonly t: number; readonly theta: number }
  /** Closest to the rest point: direction of the horizontal velocity (rad), distance signed + when going round counterclockwise, speed. */
  | { readonly kind: 'closest'; readonly t: number; readonly azimuth: number; readonly minor: number; readonly speed: number };

/** True when the bob at state s blocks beam b. */
export function inBeam(b: BeamZone, s: Readonly<State6>): boolean {
  const d = b.nx * s[0] + b.ny * s[1];
  return d > b.lo && d < b.hi;
}

/** Signed polar angle: sign from the reference direction (x), as the one-beam swing's θ. */
function polarAngle(s: Readonly<State6>, L: number): number {
  const rho = Math.hypot(s[0], s[1]);
  return Math.sign(s[0] || 1) * Math.asin(Math.min(1, rho / L));
}

/**
 * Integrates the motion and yields its events up to tEnd. Steps are at most a sixteenth of a period, so each
 * holds at most one extremum of a beam coordinate and one of the distance from the rest point; cutting a step
 * at the extremum leaves monotonic pieces whose end signs find every zone crossing.
 */
export function* sphereEvents(setup: SphericalSetup, tEnd: number): Generator<SphereEvent> {
  const { ode, omega0 } = setup;
  const S = new SphericalSeries(ode);
  const hMax = (2 * Math.PI) / omega0 / 16;
  let t = 0;
  let state = setup.start;
  yield { kind: 'turn', t: 0, theta: polarAngle(state, ode.L) };
  const found: SphereEvent[] = [];
  while (t < tEnd) {
    S.expand(state);
    const h = Math.min(S.stepSize(omega0), hMax);
    found.length = 0;
    apsides(S, h, t, ode.L, found);
    setup.beams.forEach((b, i) => beamCrossings(S, b, i, h, t, found));
    found.sort((a, b) => a.t - b.t);
    yield* found;
    t += h;
    state = project(S.at(h), ode.L);
  }
}

/** Zeros of D = x v_x + y v_y (half the rate of change of ρ²): − to + is the closest approach, + to − the farthest point. */
function apsides(S: SphericalSeries, h: number, t0: number, L: number, out: SphereEvent[]): void {
  const D = (tau: number) => horner(S.x, tau) * horner(S.vx, tau) + horner(S.y, tau) * horner(S.vy, tau);
  const dD = (tau: number) =>
    horner(S.vx, tau) ** 2 + horner(S.vy, tau) ** 2 + horner(S.x, tau) * hornerDerivative(S.vx, tau) + horner(S.y, tau) * hornerDerivative(S.vy, tau);
  const a = D(0);
  const b = D(h);
  if (!((a < 0 && b >= 0) || (a > 0 && b <= 0))) return;
  const tau = bracketedRoot(D, dD, 0, h);
  const s = S.at(tau);
  if (a > 0) {
    out.push({ kind: 'turn', t: t0 + tau, theta: polarAngle(s, L) });
    return;
  }
  const [x, y, , vx, vy] = s;
  const lz = x * vy - y * vx;
  out.push({ kind: 'closest', t: t0 + tau, azimuth: Math.atan2(vy, vx), minor: Math.sign(lz) * Math.hypot(x, y), speed: Math.hypot(vx, vy) });
}

function beamCrossings(S: SphericalSeries, b: BeamZone, beam: number, h: number, t0: number, out: SphereEvent[]): void {
  const d = (tau: number) => b.nx * horner(S.x, tau) + b.ny * horner(S.y, tau);
  const dd = (tau: number) => b.nx * horner(S.vx, tau) + b.ny * horner(S.vy, tau);
  const cuts = [0];
  const v0 = dd(0);
  const vh = dd(h);
  if ((v0 < 0 && vh > 0) || (v0 > 0 && vh < 0)) cuts.push(bracketedRoot(dd, (tau) => b.nx * hornerDerivative(S.vx, tau) + b.ny * hornerDerivative(S.vy, tau), 0, h));
  cuts.push(h);
  for (let i = 0; i + 1 < cuts.length; i++) {
    const lo = cuts[i]!;
    const hi = cuts[i + 1]!;
    const dLo = d(lo);
    const dHi = d(hi);
    const hits: { tau: number; dir: 1 | -1; edge: number }[] = [];
    for (const edge of [b.lo, b.hi]) {
      const p = dLo - edge;
      const q = dHi - edge;
      if ((p < 0 && q >= 0) || (p > 0 && q <= 0)) hits.push({ tau: bracketedRoot((tau) => d(tau) - edge, dd, lo, hi), dir: q > p ? 1 : -1, edge });
    }
    if (hits.length === 2 && hits[1]!.tau < hits[0]!.tau) hits.reverse();
    for (const c of hits) {
      // Moving up across lo, or down across hi, enters the zone.
      const entering = (c.edge === b.lo) === (c.dir === 1);
      out.push({ kind: entering ? 'enter' : 'exit', t: t0 + c.tau, beam, dir: c.dir });
    }
  }
}
