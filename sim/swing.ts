// The swinging bob as a stream of events: beam-zone entries and exits, turning points, and coming to rest.
import { TaylorSeries, type PendulumOde } from './taylor.ts';

/** Events of the bob's motion, times in seconds since release (true time). */
export type BobEvent =
  | { readonly kind: 'enter' | 'exit'; readonly t: number; readonly dir: 1 | -1 }
  | { readonly kind: 'turn'; readonly t: number; readonly theta: number }
  | { readonly kind: 'rest'; readonly t: number; readonly theta: number };

export interface SwingSetup {
  readonly ode: PendulumOde;
  readonly omega0: number;
  /** Release angle (rad), from rest at t = 0. */
  readonly theta0: number;
  /** The bob blocks the beam while θ is strictly between these angles (lo < hi). */
  readonly zone: readonly [number, number];
  /**
   * ω0² at time t since release when the length and the air follow the room: taken at every turning point,
   * so each half-swing has its own (the room changes by parts in 1e9 within one).
   */
  readonly w2At?: (t: number) => number;
}

/** True when the bob at angle θ is inside the beam zone. */
export function inZone(setup: SwingSetup, theta: number): boolean {
  return theta > setup.zone[0] && theta < setup.zone[1];
}

/**
 * Integrates the swing and yields its events in time order, up to tEnd. Zone crossings and turning points
 * are roots of the step's Taylor polynomial, so their accuracy is that of the integration, not of a sample grid.
 */
export function* bobEvents(setup: SwingSetup, tEnd: number): Generator<BobEvent> {
  const { ode, omega0 } = setup;
  let series = new TaylorSeries(setup.w2At ? { ...ode, w2: setup.w2At(0) } : ode);
  // Steps under half a period hold at most one turning point, so a sign change of θ' at the step's end finds
  // it; cutting there keeps θ monotonic within every step, so endpoint signs find every zone crossing.
  const hMax = (2 * Math.PI) / omega0 / 8;
  let t = 0;
  let theta = setup.theta0;
  let vel = 0;
  yield { kind: 'turn', t, theta };
  if (theta === 0 || sticks(ode, theta)) {
    yield { kind: 'rest', t, theta };
    return;
  }
  let sigma = -Math.sign(theta);
  const crossings: { tau: number; dir: 1 | -1; th: number }[] = [];
  while (t < tEnd) {
    series.expand(theta, vel, sigma);
    let h = Math.min(series.stepSize(omega0), hMax);
    let turning = false;
    if (series.vel(h) * sigma < 0) {
      h = series.root('vel', 0, 0, h);
      turning = true;
    }
    const thEnd = series.theta(h);
    crossings.length = 0;
    for (const th of setup.zone) {
      const a = theta - th;
      const b = thEnd - th;
      if ((a < 0 && b >= 0) || (a > 0 && b <= 0)) crossings.push({ tau: series.root('theta', th, 0, h), dir: b > a ? 1 : -1, th });
    }
    if (crossings.length === 2 && crossings[1]!.tau < crossings[0]!.tau) crossings.reverse();
    for (const c of crossings) {
      // Crossing the zone's edge toggles being inside: moving up across lo, or down across hi, enters.
      const entering = (c.th === setup.zone[0]) === (c.dir === 1);
      yield { kind: entering ? 'enter' : 'exit', t: t + c.tau, dir: c.dir };
    }
    t += h;
    theta = thEnd;
    vel = turning ? 0 : series.vel(h);
    if (turning) {
      yield { kind: 'turn', t, theta };
      sigma = -sigma;
      if (setup.w2At) series = new TaylorSeries({ ...ode, w2: setup.w2At(t) });
      if (sticks(ode, theta)) {
        yield { kind: 'rest', t, theta };
        return;
      }
    }
  }
}

/** Pivot friction holds the bob at a turning point when gravity's pull is no stronger than it. */
function sticks(ode: PendulumOde, theta: number): boolean {
  return ode.b0 > 0 && ode.w2 * Math.abs(Math.sin(theta)) <= ode.b0;
}
