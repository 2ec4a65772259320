// Simulated two-beam runs reduced to each channel's blocked intervals, with the truth matched pass by pass.
import { loadScenario, simulateEntries, type Truth } from '../../sim/index.ts';
import { planePasses, type Blocked } from '../../host/analysis/plane-passes.ts';
import { azimuthRate } from '../../host/analysis/plane-rate.ts';
import { foldAxis, type TwoBeamGeometry } from '../../host/analysis/two-beam-geometry.ts';

export interface PlaneRun {
  readonly A: Blocked[];
  readonly B: Blocked[];
  readonly truth: Truth;
  readonly geometry: Omit<TwoBeamGeometry, 'omega0'>;
  /** Device seconds of a truth time (since release), by the truth's clock model (drift left out: < 10 ms an hour). */
  readonly deviceTime: (tSinceRelease: number) => number;
  readonly periodGuess: number;
}

/** Runs a bundled plane scenario and splits its E records by channel (the beams are blocked low; one boot, no faults). */
export function planeRun(name: string, seed: number, durationS: number, overrides: { ppm?: number } = {}): PlaneRun {
  const sc = loadScenario(name);
  const { entries, truth } = simulateEntries(sc, { seed, durationS, no_faults: true, ...overrides });
  const open: Record<string, number> = {};
  const out: Record<string, Blocked[]> = { '0': [], '1': [] };
  let hz = 16e6;
  for (const e of entries) {
    if (e.kind !== 'data') continue;
    const h = /^H .* hz=(\d+)/.exec(e.line);
    if (h) hz = Number(h[1]);
    const m = /^E [0-9a-f]+ ([01]) ([fr]) ([0-9a-f]+) /.exec(e.line);
    if (!m) continue;
    const t = parseInt(m[3]!, 16) / hz;
    if (m[2] === 'f') open[m[1]!] = t;
    else if (open[m[1]!] !== undefined) {
      out[m[1]!]!.push({ start: open[m[1]!]!, end: t });
      delete open[m[1]!];
    }
  }
  const beams = sc.rig.beams!;
  const rad = Math.PI / 180;
  const boot = truth.clock.boots[0]!;
  const rate = truth.clock.hz * (1 + truth.clock.ppm * 1e-6);
  return {
    A: out[String(beams[0]!.channel)]!,
    B: out[String(beams[1]!.channel)]!,
    truth,
    geometry: { angleA: beams[0]!.angle_deg * rad, angleB: beams[1]!.angle_deg * rad, flagWidth: sc.rig.flag_width_m, length: sc.rig.length_m },
    deviceTime: (t) => ((t + truth.release_host_s - boot.host_s) * rate + boot.phase_ticks) / truth.clock.hz,
    periodGuess: truth.physics.T0_s,
  };
}

/** The run's measured rate, and the same least-squares slope of the simulator's exact azimuths at the same passes. */
export function planeRates(name: string, seed: number, dur: number): { m: { rate: number; u: number }; truth: number } {
  const run = planeRun(name, seed, dur);
  const ps = planePasses(run.A, run.B, run.geometry, run.periodGuess).passes.filter((p) => !p.flag);
  const tr = run.truth.plane!;
  const times = tr.t_s.map(run.deviceTime);
  let j = 0;
  const trueAz = ps.map((p) => {
    while (j + 1 < times.length && Math.abs(times[j + 1]! - p.t) < Math.abs(times[j]! - p.t)) j++;
    return foldAxis(tr.azimuth_deg[j]! * (Math.PI / 180), { ...run.geometry, omega0: 1 });
  });
  const t = ps.map((p) => p.t);
  return {
    m: azimuthRate(
      t,
      ps.map((p) => p.azimuth),
    )!,
    truth: azimuthRate(t, trueAz)!.rate,
  };
}
