// A synthetic analysis result for rendering tests (input only; the end-to-end test uses the simulator instead).
import type { AnalysisResult } from '../../host/analysis/result.ts';
import type { Rig } from '../../protocol/rig.ts';
import { periodRatio } from '../../host/analysis/elliptic.ts';

const DEG = Math.PI / 180;

/** A 1 m pendulum decaying exponentially from `a0Deg`, with n swings and the given overrides. */
export function syntheticResult(over: Partial<AnalysisResult> = {}, n = 300, a0Deg = 30): AnalysisResult {
  const T0 = 2.00607;
  const tau = 900;
  const t: number[] = [];
  const amp: number[] = [];
  const per: number[] = [];
  let time = 0;
  for (let i = 0; i < n; i++) {
    const a = a0Deg * Math.exp(-time / tau);
    const T = T0 * periodRatio(a * DEG) + 2e-6 * Math.sin(i * 1.7);
    t.push(time);
    amp.push(a + 0.01 * Math.cos(i * 2.3));
    per.push(T);
    time += T;
  }
  const g = (4 * Math.PI ** 2 * 1.0) / T0 ** 2;
  const base: AnalysisResult = {
    T0_s: T0,
    T0_u_s: 3.1e-6,
    g_m_s2: g,
    g_u_m_s2: 0.00123,
    clock_ppm: -1234.5,
    clock_u_ppm: 0.8,
    clock_source: 'host',
    gate_offset_m: 0.0004,
    gate_offset_u_m: 0.00005,
    gate_offset_side: 'release',
    B: 0.0627,
    B_u: 0.0004,
    C: 0.0035,
    C_u: 0.0002,
    amplitude_start_deg: amp[0]!,
    amplitude_end_deg: amp[n - 1]!,
    Q: (Math.PI * tau) / T0,
    damping_model: 'linear',
    damping_fits: [
      { model: 'linear', score: -1200, a0: 0, a1: 1 / tau, a2: 0, rms_residual_deg: 0.01 },
      { model: 'constant', score: -300, a0: (a0Deg * DEG) / tau / 2.2, a1: 0, a2: 0, rms_residual_deg: 0.9 },
    ],
    passes: 2 * n,
    periods: n,
    counts: { crc_errors: 2, bad_lines: 0, lines_lost: 3, device_lost: 0, rejected_passes: 1, bridged_gaps: 1, reboots: 0, disconnects: 0, unknown_kinds: 0, glitches: 4, bounces: 0, edge_resyncs: 0, unsequenced_passes: 0, long_gaps: 0, malformed_journal_lines: 0 },
    budget: [
      { id: 'length', name: 'length L', u_rel_g: 0.001, note: { kind: 'length', symbol: 'L', m: 1, u_m: 0.001 } },
      { id: 'statistics', name: 'timing', u_rel_g: 3.1e-6, note: { kind: 'periods', count: n } },
      { id: 'clock', name: 'clock rate', u_rel_g: 1.6e-6, note: { kind: 'clock-rate', ppm: -1234.5, u_ppm: 0.8 } },
    ],
    corrections: [
      { id: 'finite-bob', name: 'finite bob (physical pendulum)', period_rel: 1.0e-4, applied: true, why: { kind: 'bob-radius', m: 0.0127 } },
      { id: 'air', name: 'air buoyancy', period_rel: 7.5e-5, applied: false, why: { kind: 'not-applied', correction: 'air' } },
    ],
    expected_g_m_s2: 9.8105,
    g_diff_sigma: (g - 9.8105) / 0.00123,
    warnings: [{ kind: 'clock-forced-short', span_s: 120 }],
    run: { start_iso: '2026-03-14T09:30:00.000Z', duration_s: time, source: 'sim: scenario classroom', firmware: 'halfswing-fw 1.0', hz_nominal: 2e6 },
    T0_fit_s: T0 * 1.000001,
    B_theory: 1 / 16,
    C_theory: 11 / 3072,
    Q_u: 12,
    damping_tau_s: tau,
    median_amplitude_deg: amp[Math.floor(n / 2)]!,
    clock_drift_ppm_per_h: 0.05,
    clock_span_s: time,
    L_eff_m: 1.00009,
    amplitude_sensitivity: { at_amplitude_deg: 21, per_width_deg_per_mm: 0.7, per_delay_difference_deg_per_us: 0.002 },
    settings: { glitch_s: 0.0002, bounce_s: 0.0005 },
    environment: null,
    swings: [],
    plots: {
      periodVsAmplitude: { amplitude_deg: amp, period_s: per },
      amplitudeVsTime: { t_s: t, amplitude_deg: amp },
      halfPeriodAlternation: { t_s: t, diff_s: amp.map((a, i) => (i % 2 ? 1 : -1) * (4 * 0.0004) / (Math.PI * a * DEG) / 2) },
      clockResiduals: { host_s: t.filter((_, i) => i % 5 === 0), residual_s: t.filter((_, i) => i % 5 === 0).map((_, i) => 2e-4 * Math.abs(Math.sin(i * 7.1)) ** 3) },
      gRunning: { t_s: t.slice(5), g: t.slice(5).map((_, i) => g + 0.01 / (i + 1)), g_u: t.slice(5).map((_, i) => 0.00123 * Math.sqrt(300 / (i + 6))) },
      qVsAmplitude: { amplitude_deg: [28, 24, 20, 17], Q: [1390, 1420, 1401, 1415] },
    },
  };
  return { ...base, ...over };
}

/** A rig for the synthetic result. */
export const syntheticRig: Rig = {
  length_m: 1,
  length_u_m: 0.001,
  flag_width_m: 0.03,
  flag_width_u_m: 0.0001,
  bob_diameter_m: 0.03,
  blocked_level: 'low',
  beams: [{ channel: 0, angle_deg: 0 }],
  air_density_kg_m3: 1.2,
  latitude_deg: 52.2,
  elevation_m: 40,
  name: 'Bench pendulum A',
};
