// Figures: half-period alternation (the gate's offset from the lowest point), clock residuals, running g.
import type { AnalysisResult, PlotSeries } from '../../analysis/result.ts';
import { renderChart, type SeriesSpec } from '../svg/chart.ts';
import { maxAbs, noData, smallTimeUnit, timeUnit } from './figure.ts';

/** Half-period difference (long − short, by pass side) over time; a level away from zero means the gate is off centre. */
export function alternationPlot(s: PlotSeries): string {
  const h = s.halfPeriodAlternation;
  if (h.t_s.length === 0) return noData('no half-periods: the run needs consecutive passes in both directions.');
  const tu = timeUnit(maxAbs(h.t_s));
  const u = smallTimeUnit(maxAbs(h.diff_s));
  return renderChart({
    id: 'alt',
    title: 'Half-period alternation against time',
    xLabel: `time since start (${tu.name})`,
    panels: [
      {
        yLabel: `Δ half-period (${u.name})`,
        include: 0,
        series: [
          { kind: 'hline', label: '', y: 0, tone: 4 },
          { kind: 'points', label: 'half-period difference, long − short', x: h.t_s.map((v) => v / tu.div), y: h.diff_s.map((v) => v * u.mul), shape: 'triangle', tone: 1 },
        ],
      },
    ],
    plotHeight: 220,
  });
}

/** Heartbeat window minima of (host − device time) about the line fitted through them, against host time. */
export function clockPlot(r: AnalysisResult, s: PlotSeries): string {
  const c = s.clockResiduals;
  if (c.host_s.length === 0)
    return noData(r.clock_source === 'host' ? 'no heartbeats with host receive times in the journal.' : `the clock correction is ${r.clock_source}, not fitted from heartbeats.`);
  const tu = timeUnit(maxAbs(c.host_s));
  const u = smallTimeUnit(maxAbs(c.residual_s));
  const series: SeriesSpec[] = [
    { kind: 'points', label: 'window minimum of host − device time', x: c.host_s.map((v) => v / tu.div), y: c.residual_s.map((v) => v * u.mul), shape: 'circle', tone: 1 },
    { kind: 'hline', label: 'line fitted through the minima', y: 0, tone: 2 },
  ];
  return renderChart({ id: 'clock', title: 'Clock offset residuals against time', xLabel: `host time since start (${tu.name})`, panels: [{ yLabel: `offset after fit (${u.name})`, series, include: 0 }], plotHeight: 220 });
}

/** The running estimate of g with its expanded (k = 2) band, and the expected local g when known. */
export function gRunningPlot(r: AnalysisResult, s: PlotSeries): string {
  const g = s.gRunning;
  if (g.t_s.length === 0) return noData('no running estimate of g: it needs T0, so enough full periods, and the rig’s length.');
  const tu = timeUnit(maxAbs(g.t_s));
  const x = g.t_s.map((v) => v / tu.div);
  const series: SeriesSpec[] = [
    { kind: 'band', label: 'g ± U (k = 2)', x, lo: g.g.map((v, i) => v - 2 * g.g_u[i]!), hi: g.g.map((v, i) => v + 2 * g.g_u[i]!), tone: 2 },
    { kind: 'line', label: 'g from the swings so far', x, y: g.g, tone: 1 },
  ];
  if (r.expected_g_m_s2 !== null) series.push({ kind: 'hline', label: 'expected local g', y: r.expected_g_m_s2, dash: '6 4', tone: 3 });
  // The first few swings give a wide band; scale the axis to the settled part (last 80 %) and clip the rest.
  const from = Math.floor(g.g.length / 5);
  const lo = Math.min(...g.g.slice(from).map((v, i) => v - 2 * g.g_u[from + i]!), ...(r.expected_g_m_s2 !== null ? [r.expected_g_m_s2] : []));
  const hi = Math.max(...g.g.slice(from).map((v, i) => v + 2 * g.g_u[from + i]!), ...(r.expected_g_m_s2 !== null ? [r.expected_g_m_s2] : []));
  const domain = Number.isFinite(lo) && Number.isFinite(hi) ? ([lo, hi] as const) : undefined;
  return renderChart({
    id: 'grun',
    title: 'Running estimate of g',
    xLabel: `time since start (${tu.name})`,
    panels: [{ yLabel: 'g (m/s²)', series, ...(domain ? { domain } : {}) }],
    plotHeight: 240,
  });
}
