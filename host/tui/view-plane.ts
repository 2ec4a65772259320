// The plane panel of a two-beam run as data: the latest axis, the run's turning rate, the minor axis, and the top view's paths.
import type { Rig } from '../../protocol/rig.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { LivePlane } from '../pipeline/live-state.ts';
import type { TopViewPath } from './plot/top-view.ts';
import { formatFixed, formatWithU } from './format.ts';

/** Passes drawn in the top view: enough to show the axis turning or rocking, few enough to stay readable. */
export const TOP_VIEW_PASSES = 8;

export interface PlaneRow {
  readonly label: string;
  readonly value: string;
}

export interface PlaneView {
  readonly rows: readonly PlaneRow[];
  /** The newest measured passes, oldest first. */
  readonly paths: readonly TopViewPath[];
  /** Half the side of the top view's square (m): the largest semi-major axis shown, with a margin. */
  readonly halfSpan_m: number;
  /** The beam lines (rad, counterclockwise from the reference direction): each is square to its beam's normal. */
  readonly beamLines_rad: readonly number[];
}

const RAD = Math.PI / 180;

/** `+1.2 mm ↺`: the bob goes round counterclockwise seen from above when the minor axis is positive; no sense shown at 0.0. */
function minorText(b_m: number | undefined): string {
  if (b_m === undefined) return '—';
  const mm = formatFixed(b_m * 1000, 1, true);
  const turn = Number(mm) > 0 ? ' ↺' : Number(mm) < 0 ? ' ↻' : '';
  return `${mm} mm${turn}`;
}

/** `−11.52 + 0.04` (°/h): the Foucault rate (null without a latitude: `—`) and the Airy precession, each signed as the turning rate. */
export function expectedText(foucault: number | null, airy: number | null): string {
  const a = airy === null ? '—' : `${airy < 0 ? '-' : '+'} ${formatFixed(Math.abs(airy), 2)}`;
  return `${foucault === null ? '—' : formatFixed(foucault, 2, true)} ${a}`;
}

/** Null for a one-beam run (no live plane). The turning rate is the full result's (`plane`), '—' until it has one. */
export function planeView(plane: LivePlane | null, result: AnalysisResult, rig: Rig | null): PlaneView | null {
  if (!plane) return null;
  const n = plane.t_s.length;
  const from = Math.max(0, n - TOP_VIEW_PASSES);
  const paths: TopViewPath[] = [];
  for (let i = from; i < n; i++) paths.push({ azimuth_rad: plane.azimuth_deg[i]! * RAD, a_m: plane.semi_major_m[i]!, b_m: plane.minor_axis_m[i]! });
  const reach = Math.max(0, ...paths.map((p) => Math.max(Math.abs(p.a_m), Math.abs(p.b_m))));
  const halfSpan_m = reach > 0 ? reach * 1.1 : 0.1;
  const s = result.plane ?? null;
  const rows: PlaneRow[] = [
    { label: 'azimuth', value: n ? `${formatFixed(plane.azimuth_deg[n - 1], 1, true)}°` : '—' },
    // The unit in the label: a rate known to 1e-3 °/h still fits beside the top view.
    { label: 'turn°/h', value: s ? formatWithU(s.precession_deg_per_h, s.precession_u_deg_per_h, 2) : '—' },
    // What physics expects beside it (#16): Foucault at the rig's latitude + the Airy term of the measured axes.
    { label: 'Fou+Airy', value: s ? expectedText(s.foucault_deg_per_h, s.airy_deg_per_h) : '—' },
    { label: 'minor', value: minorText(plane.minor_axis_m.at(-1)) },
    { label: 'box', value: `±${formatFixed(halfSpan_m * 1000, 0)} mm, 0° →` },
  ];
  const beamLines_rad = (rig?.beams ?? []).map((b) => (b.angle_deg + 90) * RAD);
  return { rows, paths, halfSpan_m, beamLines_rad };
}
