// Figure: the reduced period against time and, with the board's room sensor, temperature, pressure and humidity
// on the same time axis, so a drift of the period can be read against the room (#18).
import type { AnalysisResult, PlotSeries } from '../../analysis/result.ts';
import { renderChart, type PanelSpec } from '../svg/chart.ts';
import { maxAbs, noData, timeUnit } from './figure.ts';

/** Window means of the reduced period as ppm from T0 (or from their own mean before T0 exists), then the room panels. */
export function t0RoomPlot(r: AnalysisResult, s: PlotSeries): string {
  const w = s.t0VsTime;
  const room = s.room;
  if ((!w || w.t_s.length === 0) && !room) return noData('no reduced periods: they need full periods and the rig’s length.');
  const tu = timeUnit(maxAbs([...(w?.t_s ?? []), ...(room?.t_s ?? [])]));
  const panels: PanelSpec[] = [];
  if (w && w.t_s.length > 0) {
    const ref = r.T0_s ?? w.T0_s.reduce((a, b) => a + b, 0) / w.T0_s.length;
    panels.push({
      yLabel: 'T0 − mean (ppm)',
      include: 0,
      weight: 1.4,
      series: [
        { kind: 'hline', label: '', y: 0, tone: 4 },
        { kind: 'points', label: 'reduced period, window mean', x: w.t_s.map((v) => v / tu.div), y: w.T0_s.map((v) => (v / ref - 1) * 1e6), shape: 'circle', tone: 1 },
      ],
    });
  }
  if (room) {
    const x = room.t_s.map((v) => v / tu.div);
    panels.push(
      { yLabel: 'temperature (°C)', series: [{ kind: 'line', label: 'temperature', x, y: room.temperature_C, tone: 2 }] },
      { yLabel: 'pressure (hPa)', weight: 0.7, series: [{ kind: 'line', label: 'pressure', x, y: room.pressure_Pa.map((p) => p / 100), dash: '6 4', tone: 3 }] },
      { yLabel: 'humidity (%RH)', weight: 0.7, series: [{ kind: 'line', label: 'relative humidity', x, y: room.humidity_pct, dash: '2 3', tone: 4 }] },
    );
  }
  return renderChart({ id: 't0-room', title: room ? 'Reduced period and the room against time' : 'Reduced period against time', xLabel: `time since start (${tu.name})`, panels, plotHeight: room ? 360 : 180 });
}
