// Figures of a two-beam run: the swing's axis and minor axis against time, and a top view of the ellipse.
import type { PlotSeries } from '../../analysis/result.ts';
import { renderChart, type SeriesSpec } from '../svg/chart.ts';
import { maxAbs, timeUnit } from './figure.ts';

type Plane = NonNullable<PlotSeries['plane']>;

/** Azimuth (°) and signed minor axis (mm) per measured pass. */
export function planeTimePlot(pl: Plane): string {
  const tu = timeUnit(maxAbs(pl.t_s));
  const x = pl.t_s.map((v) => v / tu.div);
  return renderChart({
    id: 'plane-t',
    title: 'Swing axis and minor axis against time',
    xLabel: `time since start (${tu.name})`,
    panels: [
      { yLabel: 'azimuth (°)', series: [{ kind: 'points', label: 'axis direction at each pass', x, y: pl.azimuth_deg, shape: 'circle', tone: 1 }] },
      {
        yLabel: 'minor axis (mm)',
        include: 0,
        series: [
          { kind: 'hline', label: '', y: 0, tone: 4 },
          { kind: 'points', label: 'signed minor axis (+ counterclockwise)', x, y: pl.minor_axis_m.map((v) => v * 1000), shape: 'triangle', tone: 2 },
        ],
      },
    ],
    plotHeight: 200,
  });
}

/** Ellipses of up to five passes spread over the run, seen from above (x along the reference direction). */
export function planeTopView(pl: Plane): string {
  const n = pl.t_s.length;
  const picks = [...new Set([0, 0.25, 0.5, 0.75, 1].map((f) => Math.round(f * (n - 1))))];
  const series: SeriesSpec[] = picks.map((i, k) => {
    const psi = (pl.azimuth_deg[i]! * Math.PI) / 180;
    const a = pl.semi_major_m[i]! * 1000;
    const b = pl.minor_axis_m[i]! * 1000;
    const phi = Array.from({ length: 121 }, (_, j) => (2 * Math.PI * j) / 120);
    // p = a sin φ u − b cos φ w, u along the axis, w a quarter turn counterclockwise from it.
    const px = phi.map((f) => a * Math.sin(f) * Math.cos(psi) + b * Math.cos(f) * Math.sin(psi));
    const py = phi.map((f) => a * Math.sin(f) * Math.sin(psi) - b * Math.cos(f) * Math.cos(psi));
    const tu = timeUnit(maxAbs(pl.t_s));
    return { kind: 'line', label: `t = ${(pl.t_s[i]! / tu.div).toFixed(1)} ${tu.name}`, x: px, y: py, tone: ((k % 4) + 1) as 1 | 2 | 3 | 4 };
  });
  return renderChart({ id: 'plane-top', title: 'Top view of the swing', xLabel: 'x along the reference direction (mm)', panels: [{ yLabel: 'y (mm)', series }], plotHeight: 260, width: 420 });
}
