// The plot series the report reads from an analysis result, including the optional ones it can use when present.
import type { AnalysisResult, PlotSeries } from '../analysis/result.ts';

/** OPTIONAL series the report draws when the analysis provides them (proposed in DEVELOPERS.md, "Run report"). */
export interface ExtraSeries {
  /** Q measured from neighbouring swings' amplitude loss, against amplitude. */
  readonly qVsAmplitude?: { readonly amplitude_deg: readonly number[]; readonly Q: readonly number[] };
}

export type ReportSeries = { readonly [K in keyof PlotSeries]?: PlotSeries[K] } & ExtraSeries;

/** The series of a result; every one may be absent (a short or broken run). */
export function seriesOf(r: AnalysisResult): ReportSeries {
  return (r as AnalysisResult & { series?: ReportSeries }).series ?? {};
}
