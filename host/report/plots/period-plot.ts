// Figure: period against amplitude, with the exact law and the fitted B, C curve, and the fit's residuals below.
import type { AnalysisResult, PlotSeries } from '../../analysis/result.ts';
import { renderChart, type SeriesSpec } from '../svg/chart.ts';
import { linspace, maxAbs, noData, robustDomain, smallTimeUnit } from './figure.ts';

const DEG = Math.PI / 180;

/** T/T0 at amplitude θ0 (radians) by the exact law, supplied by the analysis so report and numbers agree. */
export type PeriodLaw = (theta0Rad: number) => number;

/** The period plot's SVG, or a placeholder saying what is missing. */
export function periodPlot(r: AnalysisResult, s: PlotSeries, law: PeriodLaw): string {
  const pa = s.periodVsAmplitude;
  const n = Math.min(pa.amplitude_deg.length, pa.period_s.length);
  if (n === 0) return noData('no full periods with a measured amplitude: the run needs at least three passes through the gate in a row.');
  const amps = pa.amplitude_deg.slice(0, n);
  const periods = pa.period_s.slice(0, n);
  const main: SeriesSpec[] = [{ kind: 'points', label: 'measured period', x: amps, y: periods, shape: 'circle', tone: 1 }];
  const lower: SeriesSpec[] = [];
  const T0 = r.T0_s;
  const finiteAmps = amps.filter(Number.isFinite);
  const aMax = Math.max(...finiteAmps, 1);
  const grid = linspace(0, aMax, 120);
  if (T0 !== null) {
    main.push({ kind: 'line', label: 'exact law T0·2K(sin(θ0/2))/π', x: grid, y: grid.map((a) => T0 * law(a * DEG)), tone: 2 });
  }
  // The fit has its own T0 (its intercept), which differs slightly from the exact-law reduction's T0.
  const T0fit = r.T0_fit_s ?? T0;
  if (T0fit !== null && r.B !== null) {
    const B = r.B;
    const C = r.C ?? 0;
    const fit = (a: number): number => T0fit * (1 + B * (a * DEG) ** 2 + C * (a * DEG) ** 4);
    main.push({ kind: 'line', label: 'fit T0(1 + Bθ0² + Cθ0⁴)', x: grid, y: grid.map(fit), dash: '7 4', tone: 3 });
    const res = amps.map((a, i) => periods[i]! - fit(a));
    const lawMinusFit = T0 !== null ? grid.map((a) => T0 * law(a * DEG) - fit(a)) : [];
    const rd = robustDomain(res, [...lawMinusFit, 0]);
    const u = smallTimeUnit(rd ? Math.max(Math.abs(rd.domain[0]), Math.abs(rd.domain[1])) : Math.max(maxAbs(res), maxAbs(lawMinusFit)));
    lower.push({ kind: 'hline', label: '', y: 0, tone: 4 });
    lower.push({ kind: 'points', label: '', x: amps, y: res.map((v) => v * u.mul), shape: 'circle', tone: 1 });
    if (T0 !== null) lower.push({ kind: 'line', label: 'exact law − fit', x: grid, y: lawMinusFit.map((v) => v * u.mul), dash: '2 3', tone: 2 });
    return renderChart({
      id: 'period',
      title: 'Period against amplitude, with residuals of the B, C fit',
      xLabel: 'amplitude θ0 (degrees)',
      panels: [
        { yLabel: 'period (s)', series: main, weight: 2.4 },
        {
          yLabel: `residual (${u.name})`,
          series: lower,
          weight: 1,
          include: 0,
          ...(rd ? { domain: [rd.domain[0] * u.mul, rd.domain[1] * u.mul] as const } : {}),
          ...(rd && rd.outside > 0 ? { note: `${rd.outside} point${rd.outside > 1 ? 's' : ''} beyond the axis` } : {}),
        },
      ],
      plotHeight: 380,
    });
  }
  return renderChart({ id: 'period', title: 'Period against amplitude', xLabel: 'amplitude θ0 (degrees)', panels: [{ yLabel: 'period (s)', series: main }] });
}
