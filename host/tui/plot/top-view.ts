// The swing seen from above in a small braille box: the path of recent passes (an ellipse, or a line when the minor
// axis is nil) over the two beam lines. x points along the rig's reference direction, y 90° counterclockwise of it.
import { canvasRowRuns, createCanvas, setDot } from './braille-canvas.ts';
import type { ChartLine, ChartRun } from './chart.ts';

/** One pass's path: axis direction (rad, counterclockwise from above), semi-major axis and signed semi-minor axis (m). */
export interface TopViewPath {
  readonly azimuth_rad: number;
  readonly a_m: number;
  readonly b_m: number;
}

export interface TopViewSpec {
  /** Size of the drawing in cells (each 2×4 dots; a braille dot is about as wide as it is tall). */
  readonly cols: number;
  readonly rows: number;
  /** Half the width of the square the box shows (m): the centre is the rest point. */
  readonly halfSpan_m: number;
  /** Directions of the beam lines (rad), drawn faintly through the rest point. */
  readonly beamLines_rad: readonly number[];
  /** Oldest first; the newest is drawn last, in its own tone. */
  readonly paths: readonly TopViewPath[];
}

/** Dots along each path: enough that a path across the whole box leaves no gap. */
const PATH_STEPS = 96;

/**
 * The box as lines of tone runs (`axis` for beam lines, `fit` for older passes, `points` for the newest, `blank`):
 * exactly `rows` lines of `cols` characters. A path is x = a cos ψ cos u − b sin ψ sin u, y = a sin ψ cos u + b cos ψ sin u.
 */
export function renderTopView(spec: TopViewSpec): ChartLine[] {
  const canvas = createCanvas(spec.cols, spec.rows);
  const w = spec.cols * 2;
  const h = spec.rows * 4;
  // Square dots: one scale for both directions, set by the shorter side.
  const scale = (Math.min(w, h) / 2 - 0.5) / spec.halfSpan_m;
  const cx = (w - 1) / 2;
  const cy = (h - 1) / 2;
  const dot = (x: number, y: number): [number, number] => [cx + x * scale, cy - y * scale];
  const tones = ['axis', 'fit', 'points'];
  // Beam lines dotted every third dot, so a path along one stays readable.
  const reach = Math.hypot(w, h) / 2;
  for (const beam of spec.beamLines_rad)
    for (let k = -Math.ceil(reach); k <= reach; k += 3) setDot(canvas, cx + k * Math.cos(beam), cy - k * Math.sin(beam), 0);
  spec.paths.forEach((p, i) => {
    const tone = i === spec.paths.length - 1 ? 2 : 1;
    const [c, s] = [Math.cos(p.azimuth_rad), Math.sin(p.azimuth_rad)];
    for (let k = 0; k < PATH_STEPS; k++) {
      const u = (2 * Math.PI * k) / PATH_STEPS;
      setDot(canvas, ...dot(p.a_m * c * Math.cos(u) - p.b_m * s * Math.sin(u), p.a_m * s * Math.cos(u) + p.b_m * c * Math.sin(u)), tone);
    }
  });
  const lines: ChartLine[] = [];
  for (let row = 0; row < spec.rows; row++) {
    lines.push(canvasRowRuns(canvas, row).map((run): ChartRun => (run.tone < 0 ? { text: ' '.repeat(run.text.length), tone: 'blank' } : { text: run.text, tone: tones[run.tone]! })));
  }
  return lines;
}
