// The human summary of `halfswing analyze`: the main figures with uncertainties, the budget, counts and warnings.
import type { AnalysisResult } from '../analysis/result.ts';
import { duration } from '../report/format.ts';
import { gateFigure } from './gate-words.ts';
import { plusMinus, quoteU } from './value-u.ts';
import { warningText } from './warning-words.ts';
import { noteText } from './budget-words.ts';

const fix = (v: number | null | undefined, d: number, unit = ''): string => (v === null || v === undefined ? '—' : `${v.toFixed(d)}${unit}`);

/** Plain-text summary, one fact per line. */
export function formatSummary(r: AnalysisResult, journalName: string): string {
  const L: string[] = [];
  L.push(`halfswing analysis of ${journalName}`);
  L.push(`  run              ${r.run.start_iso ?? 'start unknown'}, ${r.run.duration_s >= 3600 ? `${(r.run.duration_s / 3600).toFixed(2)} h` : duration(r.run.duration_s)}, firmware ${r.run.firmware ?? '?'}`);
  L.push(`  passes           ${r.passes} valid, ${r.periods} full periods`);
  L.push(`  T0               ${quoteU(r.T0_s, r.T0_u_s, ' s')}   (zero amplitude, exact law 2K/π)`);
  L.push(`  g                ${quoteU(r.g_m_s2, r.g_u_m_s2, ' m/s²', { expanded: true })}`);
  if (r.expected_g_m_s2 !== null)
    L.push(`  expected g       ${r.expected_g_m_s2.toFixed(6)} m/s² (WGS-84 normal gravity; local anomalies are often ~1e-4 g): difference ${fix(r.g_diff_sigma, 2)} σ`);
  L.push(`  clock            ${plusMinus(r.clock_ppm, r.clock_u_ppm, ' ppm')} (${r.clock_source})${r.clock_drift_ppm_per_h !== null ? `, drift ${r.clock_drift_ppm_per_h.toFixed(3)} ppm/h` : ''}`);
  L.push(`  amplitude        ${plusMinus(r.amplitude_start_deg, r.amplitude_start_u_deg, '°', 5)} → ${plusMinus(r.amplitude_end_deg, r.amplitude_end_u_deg, '°', 5)}`);
  if (r.amplitude_sensitivity)
    L.push(
      `  sensitivity      at ${r.amplitude_sensitivity.at_amplitude_deg.toFixed(2)}°: ${r.amplitude_sensitivity.per_width_deg_per_mm.toFixed(4)}°/mm of flag width, ${r.amplitude_sensitivity.per_delay_difference_deg_per_us.toExponential(2)}°/µs of on/off delay difference`,
    );
  L.push(`  B, C             B = ${plusMinus(r.B, r.B_u)} (1/16 = 0.0625), C = ${plusMinus(r.C, r.C_u)} (11/3072 = 0.003581)`);
  L.push(`  gate offset      ${gateFigure(r.gate_offset_m, r.gate_offset_u_m, r.gate_offset_side)}`);
  L.push(`  damping          ${r.damping_model ?? '—'}; Q = ${plusMinus(r.Q, r.Q_u)} at ${fix(r.median_amplitude_deg, 2, '°')}; amplitude time constant ${fix(r.damping_tau_s, 0, ' s')}`);
  if (r.budget.length) {
    L.push('  uncertainty budget (relative standard uncertainty of g):');
    for (const b of r.budget) L.push(`    ${b.u_rel_g.toExponential(2).padStart(9)}  ${b.name}${b.note ? ` (${noteText(b.note)})` : ''}`);
    if (r.g_m_s2 !== null && r.g_u_m_s2 !== null) L.push(`    ${(r.g_u_m_s2 / r.g_m_s2).toExponential(2).padStart(9)}  combined (k = 1)`);
  }
  const c = r.counts;
  L.push(
    `  counts           crc errors ${c.crc_errors}, lines lost ${c.lines_lost}, device lost ${c.device_lost}, rejected passes ${c.rejected_passes}, bridged gaps ${c.bridged_gaps}, reboots ${c.reboots}, disconnects ${c.disconnects}`,
  );
  for (const w of r.warnings) L.push(`  warning: ${warningText(w)}`);
  L.push('  ± is one standard uncertainty (k = 1); an expanded one is labelled k = 2');
  return `${L.join('\n')}\n`;
}
