// A run of the spherical pendulum: its set-up from a scenario, each beam's own stream of pin edges on its own
// channel, and the per-pass truth of the swing plane.
import type { Beam } from '../protocol/rig.ts';
import type { TruePhysics } from './physics.ts';
import { initialLevel, pinEdges, type OpticsSetup, type PinEdge } from './optics.ts';
import type { Rng } from './prng.ts';
import type { Scenario } from './scenario.ts';
import { inBeam, sphereEvents, type BeamZone, type SphereEvent, type SphericalSetup } from './spherical.ts';
import type { State6 } from './spherical-taylor.ts';
import type { BobEvent } from './swing.ts';
import type { FaultCounts, PlaneTruth } from './truth.ts';

/** Earth's rotation rate, rad/s (IERS conventions; docs/references.md#ref-swing-plane). */
export const EARTH_RATE_RAD_S = 7.292115e-5;

const rad = (deg: number): number => (deg * Math.PI) / 180;

/** The rig's beams (a rig file's `channel` is one beam at angle 0). */
export function rigBeams(s: Scenario): readonly Beam[] {
  return s.rig.beams;
}

/**
 * The spherical model of a scenario. The bob is a point whose gravity is scaled to g' = ω0²L, so that a swing
 * in a plane is exactly the one-beam model's θ'' = −ω0² sin θ − b1 θ' (bob inertia, string and air included
 * through ω0). The beams cross at `gate.offset_m` along the reference direction.
 */
export function sphericalSetup(s: Scenario, p: TruePhysics): SphericalSetup {
  const plane = s.plane!;
  const L = p.length_m;
  const w2 = p.omega0 * p.omega0;
  const axis = rad(plane.stiff_axis_deg);
  const az = rad(plane.azimuth_deg);
  const th = p.release_rad;
  const lat = s.rig.latitude_deg;
  const vt = plane.transverse_m_s;
  const start: State6 = [L * Math.sin(th) * Math.cos(az), L * Math.sin(th) * Math.sin(az), -L * Math.cos(th), -vt * Math.sin(az), vt * Math.cos(az), 0];
  const half = s.rig.flag_width_m / 2;
  const beams: BeamZone[] = rigBeams(s).map((b) => {
    const a = rad(b.angle_deg);
    const mid = s.gate.offset_m * Math.cos(a);
    return { nx: Math.cos(a), ny: Math.sin(a), lo: mid - half, hi: mid + half };
  });
  return {
    ode: {
      L,
      g: w2 * L,
      kappa: w2 * ((1 + plane.frequency_split) ** 2 - 1),
      ux: Math.cos(axis),
      uy: Math.sin(axis),
      W: plane.earth_rotation && lat !== undefined ? EARTH_RATE_RAD_S * Math.sin(rad(lat)) : 0,
      b1: p.b1_per_s,
    },
    omega0: p.omega0,
    start,
    beams,
  };
}

export function emptyPlaneTruth(s: Scenario, stride: number, W: number): PlaneTruth {
  return {
    stride,
    beams: rigBeams(s).map((b) => ({ ...b })),
    earth_rate_deg_per_h: (-W * 180 * 3600) / Math.PI,
    t_s: [],
    azimuth_deg: [],
    minor_axis_m: [],
    amplitude_deg: [],
    speed_m_s: [],
  };
}

/** Whether each beam is blocked at release. */
export function beamsBlockedAtStart(setup: SphericalSetup): boolean[] {
  return setup.beams.map((b) => inBeam(b, setup.start));
}

/**
 * Splits the bob's events into one enter/exit stream per beam. `onEvent` sees every event once, as it is drawn
 * from the source; the streams may be consumed at different paces.
 */
export function splitByBeam(source: Iterator<SphereEvent>, beams: number, onEvent: (e: SphereEvent) => void): Iterator<BobEvent>[] {
  const queues: BobEvent[][] = Array.from({ length: beams }, () => []);
  let done = false;
  const stream = function* (k: number): Generator<BobEvent> {
    for (;;) {
      const q = queues[k]!;
      if (q.length) {
        yield q.shift()!;
        continue;
      }
      if (done) return;
      const r = source.next();
      if (r.done) {
        done = true;
        continue;
      }
      onEvent(r.value);
      const e = r.value;
      if (e.kind === 'enter' || e.kind === 'exit') queues[e.beam]!.push({ kind: e.kind, t: e.t, dir: e.dir });
    }
  };
  return queues.map((_, k) => stream(k));
}

/** Merges per-channel pin-edge streams, each in time order, into one, tagging each edge with its channel. */
export function* mergeChannels(streams: readonly { ch: number; edges: Iterator<PinEdge> }[]): Generator<PinEdge> {
  const heads = streams.map((s) => s.edges.next());
  for (;;) {
    let best = -1;
    for (let i = 0; i < heads.length; i++) if (!heads[i]!.done && (best < 0 || heads[i]!.value!.t < heads[best]!.value!.t)) best = i;
    if (best < 0) return;
    yield { ...(heads[best]!.value as PinEdge), ch: streams[best]!.ch };
    heads[best] = streams[best]!.edges.next();
  }
}

/**
 * Records every stride-th closest approach into the truth, with the amplitude taken as the mean of the farthest
 * points before and after it (so damping within the half swing does not bias it).
 */
export function planeRecorder(truth: PlaneTruth): (e: SphereEvent) => void {
  let n = 0;
  let lastTurn = NaN;
  let pending = false;
  return (e) => {
    if (e.kind === 'turn') {
      const a = Math.abs(e.theta);
      if (pending) truth.amplitude_deg.push((((lastTurn + a) / 2) * 180) / Math.PI);
      pending = false;
      lastTurn = a;
    } else if (e.kind === 'closest' && n++ % truth.stride === 0) {
      truth.t_s.push(e.t);
      truth.azimuth_deg.push((e.azimuth * 180) / Math.PI);
      truth.minor_axis_m.push(e.minor);
      truth.speed_m_s.push(e.speed);
      pending = true;
    }
  };
}

/** Pin edges of every beam, merged in time order, each on its beam's channel. Stray objects cross beam 0 only. */
export function planeEdges(
  s: Scenario,
  setup: SphericalSetup,
  optics: OpticsSetup,
  rng: Rng,
  counts: FaultCounts,
  truth: PlaneTruth,
  onBob: (e: BobEvent) => void,
  tEnd: number,
): Generator<PinEdge> {
  const beams = rigBeams(s);
  const blocked = beamsBlockedAtStart(setup);
  const record = planeRecorder(truth);
  const streams = splitByBeam(sphereEvents(setup, tEnd), beams.length, (e) => {
    record(e);
    // The one-beam truth series (turning points, beam 0's passes) stay filled as before.
    if (e.kind === 'turn' || ((e.kind === 'enter' || e.kind === 'exit') && e.beam === 0)) onBob(e);
  });
  return mergeChannels(
    beams.map((b, k) => ({
      ch: b.channel,
      edges: pinEdges({ ...optics, objects: k === 0 ? optics.objects : [], bobStartsBlocked: blocked[k]! }, streams[k]!, rng.fork(`optics${k}`), counts, () => undefined),
    })),
  );
}

/** Levels of the beams after the first, before any edge. */
export function otherBeamLevels(s: Scenario, setup: SphericalSetup, optics: OpticsSetup): { ch: number; level: 0 | 1 }[] {
  const blocked = beamsBlockedAtStart(setup);
  return rigBeams(s)
    .slice(1)
    .map((b, i) => ({ ch: b.channel, level: initialLevel({ ...optics, objects: [], bobStartsBlocked: blocked[i + 1]! }) }));
}
