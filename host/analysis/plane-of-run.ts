// The swing plane of a two-beam run, aligned with beam A's passes: what the analysis composition needs.
import type { Rig } from '../../protocol/rig.ts';
import { planePasses, type Blocked } from './plane-passes.ts';
import { summarizePlane, type PlaneSummary } from './plane-rate.ts';

export interface RunPlane {
  /** The `plane` object of `analyze --json`. */
  readonly summary: PlaneSummary | null;
  /** Per pass of beam A (NaN where unpaired or flagged): azimuth (°), signed minor axis (m), the square-crossing transit (s). */
  readonly azimuthDeg: Float64Array;
  readonly minorM: Float64Array;
  readonly semiMajorM: Float64Array;
  readonly squareTransit: Float64Array;
}

const rad = Math.PI / 180;

/** Null for a one-beam rig. `A` and `B` are the two beams' blocked intervals (s, one timebase), A on `beams[0]`. */
export function runPlane(rig: Rig, A: readonly Blocked[], B: readonly Blocked[]): RunPlane | null {
  if (rig.beams.length !== 2) return null;
  const n = A.length;
  const col = (): Float64Array => new Float64Array(n).fill(NaN);
  const out = { azimuthDeg: col(), minorM: col(), semiMajorM: col(), squareTransit: col() };
  const geometry = { angleA: rig.beams[0].angle_deg * rad, angleB: rig.beams[1].angle_deg * rad, flagWidth: rig.flag_width_m, length: rig.length_m };
  // Any period within a factor of ~2 pairs the beams; the simple pendulum's is close enough.
  const guess = 2 * Math.PI * Math.sqrt(rig.length_m / 9.81);
  const { passes, omega0 } = planePasses(A, B, geometry, guess);
  for (const p of passes) {
    if (p.flag) continue;
    out.azimuthDeg[p.index] = p.azimuth / rad;
    out.minorM[p.index] = p.b;
    out.semiMajorM[p.index] = p.a;
    out.squareTransit[p.index] = p.squareTransit;
  }
  const summary = summarizePlane(passes, { lengthM: rig.length_m, omega0, ...(rig.latitude_deg !== undefined ? { latitudeDeg: rig.latitude_deg } : {}) });
  return { summary, ...out };
}
