// Figures: amplitude against time with the damping fits (linear and log axes), and Q against amplitude.
import type { AnalysisResult, DampingFit, PlotSeries } from '../../analysis/result.ts';
import { renderChart, type SeriesSpec, type Tone } from '../svg/chart.ts';
import type { ScaleKind } from '../svg/scale.ts';
import { dampingCurve, qOfAmplitude } from './damping-curve.ts';
import { linspace, noData, timeUnit } from './figure.ts';

const MODEL_NAME: Record<DampingFit['model'], string> = {
  linear: 'exponential (loss ∝ A)',
  quadratic: 'quadratic (loss ∝ A²)',
  constant: 'constant friction',
  mixed: 'mixed',
};

/** The label of a damping model in the report's words. */
export function modelName(m: DampingFit['model']): string {
  return MODEL_NAME[m];
}

const DASHES = ['', '8 4', '3 3', '10 3 2 3'];

function finitePoints(s: PlotSeries): { t: number[]; a: number[] } {
  const at = s.amplitudeVsTime;
  const t: number[] = [];
  const a: number[] = [];
  for (let i = 0; i < Math.min(at.t_s.length, at.amplitude_deg.length); i++) {
    if (Number.isFinite(at.t_s[i]!) && Number.isFinite(at.amplitude_deg[i]!)) {
      t.push(at.t_s[i]!);
      a.push(at.amplitude_deg[i]!);
    }
  }
  return { t, a };
}

/** Fits in display order: the chosen model first (solid), the others after it (dashed). */
function orderedFits(r: AnalysisResult): DampingFit[] {
  return [...r.damping_fits].sort((x, y) => Number(y.model === r.damping_model) - Number(x.model === r.damping_model));
}

/** Amplitude against time on a linear or a log amplitude axis. */
export function amplitudePlot(r: AnalysisResult, s: PlotSeries, yScale: ScaleKind): string {
  const { t, a } = finitePoints(s);
  if (t.length === 0) return noData('no amplitudes: amplitude comes from each pass’s transit time, so the run needs complete passes and the rig’s flag width.');
  const tu = timeUnit(Math.max(...t));
  const series: SeriesSpec[] = [{ kind: 'points', label: 'amplitude per swing', x: t.map((v) => v / tu.div), y: a, shape: 'circle', tone: 1 }];
  orderedFits(r).forEach((f, i) => {
    const c = dampingCurve(f, t[0]!, a[0]!, t[t.length - 1]!);
    const chosen = f.model === r.damping_model;
    series.push({
      kind: 'line',
      label: `${modelName(f.model)}${chosen ? ' — chosen' : ''}`,
      x: c.t_s.map((v) => v / tu.div),
      y: c.amplitude_deg,
      dash: DASHES[i % DASHES.length]!,
      tone: (chosen ? 2 : i === 1 ? 3 : 4) as Tone,
    });
  });
  return renderChart({
    id: `amp-${yScale}`,
    title: `Amplitude against time${yScale === 'log' ? ' (log scale)' : ''}, with damping fits`,
    xLabel: `time since start (${tu.name})`,
    panels: [{ yLabel: 'amplitude (degrees)', yScale, series, ...(yScale === 'linear' ? { include: 0 } : {}) }],
  });
}

/** Q against amplitude: the chosen fit's curve, measured points when given, and the headline Q at the median amplitude. */
export function qPlot(r: AnalysisResult, s: PlotSeries): string {
  const { a } = finitePoints(s);
  const fit = r.damping_fits.find((f) => f.model === r.damping_model);
  const measured = s.qVsAmplitude.Q.length > 0 ? s.qVsAmplitude : null;
  if ((!fit || r.T0_s === null || a.length < 2) && !measured) return noData('no damping fit: Q needs amplitudes over enough swings to see them decay.');
  const series: SeriesSpec[] = [];
  if (measured) series.push({ kind: 'points', label: 'measured in windows of the run', x: measured.amplitude_deg, y: measured.Q, shape: 'square', tone: 3 });
  if (fit && r.T0_s !== null && a.length >= 2) {
    const T0 = r.T0_s;
    const grid = linspace(Math.min(...a), Math.max(...a), 100);
    series.push({ kind: 'line', label: `${modelName(fit.model)} fit`, x: grid, y: grid.map((v) => qOfAmplitude(fit, T0, v)), tone: 2 });
  }
  if (r.Q !== null && r.median_amplitude_deg !== null) {
    series.push({ kind: 'points', label: 'Q at the median amplitude', x: [r.median_amplitude_deg], y: [r.Q], shape: 'diamond', tone: 1 });
  }
  return renderChart({ id: 'q', title: 'Quality factor against amplitude', xLabel: 'amplitude θ0 (degrees)', panels: [{ yLabel: 'quality factor Q', series }], plotHeight: 240 });
}
