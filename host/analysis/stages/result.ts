// Stage: the result object (result.ts) from the outputs of the stages.
import type { GateDelay } from '../delay-fit.ts';
import type { GateOffset } from '../gate-offset.ts';
import type { GateSide, Warning } from '../warning.ts';
import type { RunData } from '../passes.ts';
import type { PeriodLawFit } from '../period-law.ts';
import type { AmplitudeSensitivityReport, AnalysisResult, EnvironmentResult, PlotSeries, SwingRow } from '../result.ts';
import type { Budget } from './budget.ts';
import type { Corrected } from './corrections.ts';
import type { Decay } from './decay.ts';
import type { DerivedU, FigureU } from './derived-uncertainty.ts';
import type { Periods } from './periods.ts';

const DEG = 180 / Math.PI;

/** The stage outputs that make up a result. */
export interface ResultParts {
  readonly periods: Periods;
  readonly decay: Decay;
  readonly law: PeriodLawFit | null;
  readonly gate: GateOffset | null;
  readonly delay: GateDelay | null;
  readonly derivedU: DerivedU | null;
  readonly gateSide: GateSide;
  readonly corrected: Corrected;
  readonly budget: Budget;
  readonly expected: number | null;
  readonly sensitivity: AmplitudeSensitivityReport | null;
  readonly warnings: Warning[];
  readonly swings: SwingRow[];
  readonly plots: PlotSeries;
  readonly environment: EnvironmentResult | null;
}

const finiteOrNull = (v: number | null | undefined): number | null => (v !== null && v !== undefined && Number.isFinite(v) ? v : null);

/** g − expected in combined standard uncertainties. */
function diffSigma(g: number | null, gU: number | null, expected: number | null): number | null {
  return g !== null && gU !== null && expected !== null && gU > 0 ? (g - expected) / gU : null;
}

/** A figure's combined standard uncertainty when the systematic terms were sized, else its scatter alone. */
const withTerms = (f: FigureU | null | undefined, scatter: number | null): number | null => finiteOrNull(f ? f.u : scatter);

/** The result stage. */
export function assembleResult(d: RunData, r: ResultParts): AnalysisResult {
  const { law, gate, corrected, budget, decay } = r;
  const du = r.derivedU;
  const damping = decay.damping;
  const amps = decay.amplitude;
  return {
    T0_s: finiteOrNull(corrected.T0),
    T0_u_s: finiteOrNull(budget.T0_u),
    g_m_s2: finiteOrNull(corrected.g),
    g_u_m_s2: finiteOrNull(budget.g_u),
    clock_ppm: d.clock.ppm,
    clock_u_ppm: d.clock.u_ppm,
    clock_source: d.clock.source,
    gate_offset_m: gate ? finiteOrNull(gate.offset_m) : null,
    gate_offset_u_m: gate ? withTerms(du?.gate_offset_m, gate.offset_u_m) : null,
    gate_offset_side: r.gateSide,
    B: law ? law.B : null,
    B_u: law ? withTerms(du?.B, law.B_u) : null,
    C: law ? law.C : null,
    C_u: law && law.C !== null ? withTerms(du?.C, law.C_u) : null,
    amplitude_start_deg: amps.length ? amps[0]! * DEG : null,
    amplitude_end_deg: amps.length ? amps[amps.length - 1]! * DEG : null,
    amplitude_start_u_deg: amps.length ? withTerms(du?.amplitude_start_deg, null) : null,
    amplitude_end_u_deg: amps.length ? withTerms(du?.amplitude_end_deg, null) : null,
    gate_delay: r.delay,
    derived_u: du,
    Q: damping ? damping.Q : null,
    damping_model: damping ? damping.best.model : null,
    damping_fits: damping ? damping.fits : [],
    passes: r.periods.validCount,
    periods: r.periods.P.length,
    counts: d.counts,
    budget: budget.rows,
    corrections: corrected.model ? corrected.model.lines : [],
    expected_g_m_s2: r.expected,
    g_diff_sigma: finiteOrNull(diffSigma(corrected.g, budget.g_u, r.expected)),
    warnings: r.warnings,
    T0_fit_s: law ? law.T0 : null,
    B_theory: 1 / 16,
    C_theory: 11 / 3072,
    Q_u: damping ? withTerms(du?.Q, decay.Q_u) : null,
    Q_lower_bound: decay.bound ? finiteOrNull(decay.bound.qLower) : null,
    damping_tau_s: damping ? damping.tau_s : null,
    median_amplitude_deg: Number.isFinite(decay.median) ? decay.median * DEG : null,
    median_amplitude_u_deg: Number.isFinite(decay.median) ? withTerms(du?.median_amplitude_deg, null) : null,
    clock_drift_ppm_per_h: d.clock.drift_ppm_per_h,
    clock_span_s: d.clock.span_s,
    L_eff_m: corrected.model ? corrected.model.L_eff_m : null,
    amplitude_sensitivity: r.sensitivity,
    settings: d.settings,
    line_rejections: d.lineRejections ?? {},
    environment: r.environment,
    plane: d.plane?.summary ?? null,
    swings: r.swings,
    plots: r.plots,
    run: d.run,
  };
}
