// The analysis result: what `analyze --json` prints (with its warnings and notes in words: host/output/result-json.ts),
// what the report draws and what the live view shows.
// SI units throughout; every `_u` is a standard uncertainty (k = 1).
import type { GateSide, Warning } from './warning.ts';
import type { RejectReason } from '../../protocol/records.ts';
import type { GateDelay } from './delay-fit.ts';
import type { PlaneSummary } from './plane-rate.ts';
import type { DerivedU } from './stages/derived-uncertainty.ts';
import type { BudgetNote, CorrectionNote } from './budget-note.ts';

/** Fault and health counts of a run. */
export interface RunCounts {
  readonly crc_errors: number;
  /** Lines rejected for any other reason (too long, bad field, non-ASCII, truncated). */
  readonly bad_lines: number;
  /** Lines missing by sequence gaps within a boot. */
  readonly lines_lost: number;
  /** Edges the device reported dropped (`lost` of T, summed over boots). */
  readonly device_lost: number;
  readonly rejected_passes: number;
  readonly bridged_gaps: number;
  /** Time-base restarts after the first hello. */
  readonly reboots: number;
  /** `disconnect` annotations in the journal. */
  readonly disconnects: number;
  readonly unknown_kinds: number;
  /** Blocked intervals shorter than the glitch width, dropped. */
  readonly glitches: number;
  /** Unblocked gaps shorter than the bounce gap, merged into one transit. */
  readonly bounces: number;
  /** Mismatched edge sequences (two block starts in a row, or an end without a start) that were resynchronised. */
  readonly edge_resyncs: number;
  /** Passes too few in a boot to start a beat, left out without blame. */
  readonly unsequenced_passes: number;
  /** Gaps longer than the bridging limit (they start a new segment). */
  readonly long_gaps: number;
  /** Journal lines that are not journal format (malformed). */
  readonly malformed_journal_lines: number;
}

/** What a correction accounts for (stable; the display text is `name`). */
export type CorrectionId = 'finite-bob' | 'string-mass' | 'air' | 'damping';

/**
 * What a budget line stands for (stable; the display text is `name`). A correction's line has the correction's id.
 * The last group belongs to the budgets of `combine` (reversible pendulum, tuning series, two lengths).
 */
export type BudgetId =
  | 'length'
  | 'statistics'
  | 'clock'
  | 'flag-width'
  | 'delay-difference'
  | 'room-T0'
  | 'room-length'
  | CorrectionId
  | 'knife-edge-distance'
  | 'centre-of-mass-distances'
  | 'pivot-1-statistics'
  | 'pivot-2-statistics'
  | 'amplitude-reduction'
  | 'flag-radius'
  | 'crossing-period'
  | 'length-differences'
  | 'length-t0'
  | 'length-corrections';

/** One line of the uncertainty budget: the relative standard uncertainty this input contributes to g. */
export interface BudgetLine {
  readonly id: BudgetId;
  /** Display text. */
  readonly name: string;
  readonly u_rel_g: number;
  /** What the input is: its value and standard uncertainty, or its counts (worded by host/output/budget-words.ts). */
  readonly note?: BudgetNote;
}

/** A correction considered for g: its size, and whether it was applied. */
export interface CorrectionLine {
  readonly id: CorrectionId;
  /** Display text. */
  readonly name: string;
  /** Relative change of the period it accounts for (ΔT/T0). */
  readonly period_rel: number;
  readonly applied: boolean;
  /** What it was computed from, or why not applied (worded by host/output/budget-words.ts). */
  readonly why: CorrectionNote;
  /** Its standard uncertainty as a relative period change, where it is not the default 10 % of its size. */
  readonly u_rel?: number;
}

/** One swing: a full period from every second pass, with the amplitude measured on it. */
export interface SwingRow {
  readonly index: number;
  /** Pass time, seconds since run start on the corrected device timebase joined to host time. */
  readonly t_s: number;
  readonly transit_s: number;
  readonly half_period_s: number | null;
  readonly period_s: number | null;
  readonly amplitude_deg: number | null;
  /** The period reduced to zero amplitude with the exact law. */
  readonly period0_s: number | null;
  /** Flags such as `bridged`, `rejected:<reason>`, `boot-start`. */
  readonly flags: readonly string[];
  /** Two-beam runs: the swing's axis (° counterclockwise from above) and signed minor axis (m) at this pass. */
  readonly azimuth_deg?: number | null;
  readonly minor_axis_m?: number | null;
  /** Runs with room readings: the room at this pass, interpolated between readings (null across a gap in them). */
  readonly temperature_C?: number | null;
  readonly pressure_Pa?: number | null;
  readonly humidity_pct?: number | null;
}

/** The room as the board's sensor read it, and what it did to the length (issue contract: analyze --json key `environment`). */
export interface EnvironmentResult {
  /** Of the readings as sent. */
  readonly temperature_mean_C: number;
  readonly temperature_min_C: number;
  readonly temperature_max_C: number;
  readonly pressure_mean_Pa: number;
  readonly humidity_mean_pct: number;
  /** CIPM-2007 with x_CO2 = 0.0004, at the mean conditions. */
  readonly air_density_kg_m3: number;
  /** The effective length's coefficient, after the air correction when the rig gives bob_density_kg_m3. */
  readonly length_temp_coeff_ppm_per_K: number | null;
  readonly length_temp_coeff_u_ppm_per_K: number | null;
  /** The mean of the readings' temperatures. */
  readonly reference_temperature_C: number;
}

/** Damping fits of amplitude vs time. */
export interface DampingFit {
  readonly model: 'linear' | 'quadratic' | 'constant' | 'mixed';
  /** Criterion value (lower is better), e.g. AIC. */
  readonly score: number;
  /** Coefficients of dA/dt = −(a0 + a1·A + a2·A²), A in radians, t in seconds. */
  readonly a0: number;
  readonly a1: number;
  readonly a2: number;
  readonly rms_residual_deg: number;
}

/** Series for plots (report and live view). Arrays are parallel within each object. */
export interface PlotSeries {
  readonly periodVsAmplitude: { readonly amplitude_deg: number[]; readonly period_s: number[] };
  readonly amplitudeVsTime: { readonly t_s: number[]; readonly amplitude_deg: number[] };
  readonly halfPeriodAlternation: { readonly t_s: number[]; readonly diff_s: number[] };
  readonly clockResiduals: { readonly host_s: number[]; readonly residual_s: number[] };
  readonly gRunning: { readonly t_s: number[]; readonly g: number[]; readonly g_u: number[] };
  /** Q measured in windows of the run, against the window's mean amplitude. */
  readonly qVsAmplitude: { readonly amplitude_deg: number[]; readonly Q: number[] };
  /** Two-beam runs: the swing's axis, signed minor axis and semi-major axis per measured pass. */
  readonly plane?: { readonly t_s: number[]; readonly azimuth_deg: number[]; readonly minor_axis_m: number[]; readonly semi_major_m: number[] };
  /** The period reduced to zero amplitude (no other correction), averaged in windows of equal count over the run. */
  readonly t0VsTime?: { readonly t_s: number[]; readonly T0_s: number[] };
  /** Runs with room readings: the readings as sent, placed at their arrival time. */
  readonly room?: { readonly t_s: number[]; readonly temperature_C: number[]; readonly pressure_Pa: number[]; readonly humidity_pct: number[] };
}

/** How sensitive the amplitude is to the inputs of the transit-time solution, at the run's median amplitude. */
export interface AmplitudeSensitivityReport {
  readonly at_amplitude_deg: number;
  /** dθ0/dw, degrees per millimetre of flag width. */
  readonly per_width_deg_per_mm: number;
  /** dθ0/dΔ, degrees per microsecond of (blocking − unblocking) sensor delay difference. */
  readonly per_delay_difference_deg_per_us: number;
}

/** The whole analysis of a journal (or of the lines seen so far, live). */
export interface AnalysisResult {
  readonly T0_s: number | null;
  readonly T0_u_s: number | null;
  readonly g_m_s2: number | null;
  readonly g_u_m_s2: number | null;
  readonly clock_ppm: number | null;
  readonly clock_u_ppm: number | null;
  /** How the clock correction was obtained. */
  readonly clock_source: 'host' | 'pps' | 'nominal' | 'given';
  readonly gate_offset_m: number | null;
  readonly gate_offset_u_m: number | null;
  /** 'release' when the run recorded the release, so the offset's sign is toward the release side; null when it joined mid-swing (the sign is then toward wherever the bob was before the first pass, which nobody knows). */
  readonly gate_offset_side: GateSide;
  readonly B: number | null;
  readonly B_u: number | null;
  readonly C: number | null;
  readonly C_u: number | null;
  readonly amplitude_start_deg: number | null;
  readonly amplitude_end_deg: number | null;
  /** Standard uncertainties of the first and last pass's amplitude and of the median: scatter, flag width, delay difference. */
  readonly amplitude_start_u_deg?: number | null;
  readonly amplitude_end_u_deg?: number | null;
  readonly median_amplitude_u_deg?: number | null;
  /**
   * The sensor's on/off delay difference (blocking − unblocking, s) the amplitudes are solved with: fitted from the
   * misfit of the periods against the exact law, the assumed value as a prior (`source` 'prior' when the run's
   * amplitude range is too narrow to pin it). Null without a rig.
   */
  readonly gate_delay?: GateDelay | null;
  /** The parts of the standard uncertainties of B, C, the amplitudes, Q and the gate offset (`u` is the figure's `_u`). */
  readonly derived_u?: DerivedU | null;
  readonly Q: number | null;
  readonly damping_model: DampingFit['model'] | null;
  readonly damping_fits: readonly DampingFit[];
  readonly passes: number;
  readonly periods: number;
  readonly counts: RunCounts;
  readonly budget: readonly BudgetLine[];
  readonly corrections: readonly CorrectionLine[];
  readonly expected_g_m_s2: number | null;
  /** (g − expected) / combined standard uncertainty, when the expected g is known. */
  readonly g_diff_sigma: number | null;
  /** Typed warnings; their words come from host/output/warning-words.ts. */
  readonly warnings: readonly Warning[];
  /** T0 of the fit T = T0(1 + Bθ0² + Cθ0⁴), for comparison with the exact reduction. */
  readonly T0_fit_s: number | null;
  /** The simple-pendulum values B = 1/16 and C = 11/3072, for comparison. */
  readonly B_theory: number;
  readonly C_theory: number;
  readonly Q_u: number | null;
  /** When the run shows no measurable decay (Q null): Q is at least this (two standard uncertainties of the decay rate). */
  readonly Q_lower_bound?: number | null;
  /** Amplitude time constant A/|dA/dt| at the median amplitude. */
  readonly damping_tau_s: number | null;
  readonly median_amplitude_deg: number | null;
  readonly clock_drift_ppm_per_h: number | null;
  readonly clock_span_s: number | null;
  readonly L_eff_m: number | null;
  readonly amplitude_sensitivity: AmplitudeSensitivityReport | null;
  /** Edge cleaning settings used, seconds. */
  readonly settings: { readonly glitch_s: number; readonly bounce_s: number };
  /** Device lines rejected by the decoder, by reason (always filled; optional so that older fixtures compile). */
  readonly line_rejections?: Readonly<Partial<Record<RejectReason, number>>>;
  /** The room beside the swing (the journal's A records); null without them. */
  readonly environment: EnvironmentResult | null;
  /** The swing plane of a two-beam run (docs/two-beam-geometry.md); null for one beam. */
  readonly plane?: PlaneSummary | null;
  /** One row per pass (rejected ones flagged), in time order. Not part of `analyze --json`. */
  readonly swings: readonly SwingRow[];
  /** Downsampled series for plots (≤ ~2000 points each). */
  readonly plots: PlotSeries;
  readonly run: {
    readonly start_iso: string | null;
    readonly duration_s: number;
    readonly source: string | null;
    readonly firmware: string | null;
    readonly hz_nominal: number | null;
  };
}

/** All-zero counts, for fixtures and for a pipeline that has seen nothing. */
export const ZERO_RUN_COUNTS: RunCounts = {
  crc_errors: 0,
  bad_lines: 0,
  lines_lost: 0,
  device_lost: 0,
  rejected_passes: 0,
  bridged_gaps: 0,
  reboots: 0,
  disconnects: 0,
  unknown_kinds: 0,
  glitches: 0,
  bounces: 0,
  edge_resyncs: 0,
  unsequenced_passes: 0,
  long_gaps: 0,
  malformed_journal_lines: 0,
};

/** The result of an empty run (every value null, no rows): a base for hand-made fixtures (`{ ...EMPTY_RESULT, T0_s: 2 }`). */
export const EMPTY_RESULT: AnalysisResult = {
  T0_s: null,
  T0_u_s: null,
  g_m_s2: null,
  g_u_m_s2: null,
  clock_ppm: null,
  clock_u_ppm: null,
  clock_source: 'nominal',
  gate_offset_m: null,
  gate_offset_u_m: null,
  gate_offset_side: null,
  B: null,
  B_u: null,
  C: null,
  C_u: null,
  amplitude_start_deg: null,
  amplitude_end_deg: null,
  Q: null,
  damping_model: null,
  damping_fits: [],
  passes: 0,
  periods: 0,
  counts: ZERO_RUN_COUNTS,
  budget: [],
  corrections: [],
  expected_g_m_s2: null,
  g_diff_sigma: null,
  warnings: [],
  T0_fit_s: null,
  B_theory: 1 / 16,
  C_theory: 11 / 3072,
  Q_u: null,
  Q_lower_bound: null,
  damping_tau_s: null,
  median_amplitude_deg: null,
  clock_drift_ppm_per_h: null,
  clock_span_s: null,
  L_eff_m: null,
  amplitude_sensitivity: null,
  settings: { glitch_s: 1e-4, bounce_s: 1e-4 },
  environment: null,
  plane: null,
  swings: [],
  plots: {
    periodVsAmplitude: { amplitude_deg: [], period_s: [] },
    amplitudeVsTime: { t_s: [], amplitude_deg: [] },
    halfPeriodAlternation: { t_s: [], diff_s: [] },
    clockResiduals: { host_s: [], residual_s: [] },
    gRunning: { t_s: [], g: [], g_u: [] },
    qVsAmplitude: { amplitude_deg: [], Q: [] },
  },
  run: { start_iso: null, duration_s: 0, source: null, firmware: null, hz_nominal: null },
};
