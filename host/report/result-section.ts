// The result box: T0 and g ± u (k = 1), g's expanded uncertainty (k = 2), the expected local g, the clock correction; then the
// secondary results (B, C, gate offset, amplitudes, Q) and what could not be computed and why.
import type { AnalysisResult } from '../analysis/result.ts';
import { esc } from './escape.ts';
import { duration, fixed, sig, valueU } from './format.ts';
import { modelName } from './plots/damping-plots.ts';

/** A number with its key, so a reader (and the tests) can tie it to the `--json` field it shows. */
function num(key: string, text: string): string {
  return `<span class="num" data-key="${esc(key)}">${esc(text)}</span>`;
}

function pm(v: number, u: number | null, keyV: string, keyU: string, scale = 1): string {
  const f = valueU(v * scale, u === null ? null : u * scale);
  return `${num(keyV, f.value)}${f.u !== null ? ` <span class="pm">±</span> ${num(keyU, f.u)}` : ''}`;
}

const missing = '<span class="muted">not available</span>';
/** The headline's coverage label: each ± there says its k (host/output/value-u.ts). */
const K1 = ' <span class="k">(k = 1)</span>';

const CLOCK_SOURCE: Record<AnalysisResult['clock_source'], string> = {
  host: 'fitted from heartbeats against the host clock (lower envelope of delay)',
  pps: 'measured against a 1 PPS reference',
  nominal: 'none: the nominal rate was used',
  given: 'given on the command line',
};

/** The headline box. */
export function resultBox(r: AnalysisResult): string {
  const T0 = r.T0_s !== null ? `${pm(r.T0_s, r.T0_u_s, 'T0_s', 'T0_u_s')} s${r.T0_u_s !== null ? K1 : ''}` : missing;
  let g = missing;
  if (r.g_m_s2 !== null) {
    const U = valueU(r.g_m_s2, r.g_u_m_s2, 2);
    g =
      `${pm(r.g_m_s2, r.g_u_m_s2, 'g_m_s2', 'g_u_m_s2')} m/s²${r.g_u_m_s2 !== null ? K1 : ''}` +
      (U.u !== null ? `<span class="sub">expanded: ${num('g_m_s2', U.value)} <span class="pm">±</span> ${num('g_U_k2', U.u)} m/s² (k = 2)</span>` : '');
  }
  let expected = '<span class="muted">unknown: add latitude_deg and elevation_m to the rig file</span>';
  if (r.expected_g_m_s2 !== null) {
    const d = r.g_diff_sigma !== null ? `<span class="sub">difference ${num('g_diff_sigma', fixed(r.g_diff_sigma, 2))} σ (in units of u)</span>` : '';
    expected = `${num('expected_g_m_s2', fixed(r.expected_g_m_s2, 5))} m/s²${d}`;
  }
  const clock =
    r.clock_ppm !== null
      ? `${pm(r.clock_ppm, r.clock_u_ppm, 'clock_ppm', 'clock_u_ppm')} ppm<span class="sub">${esc(CLOCK_SOURCE[r.clock_source])}</span>`
      : `${missing}<span class="sub">${esc(CLOCK_SOURCE[r.clock_source])}</span>`;
  return (
    `<section class="result" id="result"><h2>Result</h2><dl>` +
    `<div class="big"><dt>T0, period at zero amplitude</dt><dd>${T0}</dd></div>` +
    `<div class="big"><dt>g, local acceleration of gravity</dt><dd>${g}</dd></div>` +
    `<div><dt>expected local g (WGS-84 normal gravity, free-air)</dt><dd>${expected}</dd></div>` +
    `<div><dt>clock correction used</dt><dd>${clock}</dd></div>` +
    `</dl><p class="small">Uncertainties after “±” are standard uncertainties (k = 1); an expanded uncertainty is labelled k = 2.</p></section>`
  );
}

/** Secondary results, as a compact table. */
export function detailsTable(r: AnalysisResult): string {
  const rows: [string, string, string][] = [];
  const add = (k: string, v: string, ref = ''): void => void rows.push([k, v, ref]);
  add('B (θ0² coefficient)', r.B !== null ? pm(r.B, r.B_u, 'B', 'B_u') : missing, `simple pendulum: 1/16 = ${sig(r.B_theory, 4)}`);
  add('C (θ0⁴ coefficient)', r.C !== null ? pm(r.C, r.C_u, 'C', 'C_u') : missing, `simple pendulum: 11/3072 ≈ ${sig(r.C_theory, 4)}`);
  add('T0 of that fit', r.T0_fit_s !== null ? `${num('T0_fit_s', sig(r.T0_fit_s, 8))} s` : missing, 'its intercept; compare with T0 above');
  add('effective length L_eff', r.L_eff_m !== null ? `${num('L_eff_m', sig(r.L_eff_m, 6))} m` : missing, 'pivot to centre of oscillation, after corrections');
  const side = r.gate_offset_side === 'release';
  add(
    'gate offset from the lowest point',
    r.gate_offset_m !== null ? `${pm(r.gate_offset_m, r.gate_offset_u_m, 'gate_offset_mm', 'gate_offset_u_mm', 1000)} mm` : missing,
    side ? 'positive: toward the release side' : 'sign toward the side the bob was on before the first pass; that side is not known (the recording began mid-swing): move the gate 1 mm either way and re-run',
  );
  add(
    'amplitude, first → last swing',
    r.amplitude_start_deg !== null && r.amplitude_end_deg !== null
      ? `${num('amplitude_start_deg', fixed(r.amplitude_start_deg, 2))}° → ${num('amplitude_end_deg', fixed(r.amplitude_end_deg, 2))}°`
      : missing,
  );
  add('Q at the median amplitude', r.Q !== null ? (r.Q_u !== null ? pm(r.Q, r.Q_u, 'Q', 'Q_u') : num('Q', sig(r.Q, 4))) : missing, r.median_amplitude_deg !== null ? `median amplitude ${fixed(r.median_amplitude_deg, 2)}°` : '');
  add('amplitude time constant', r.damping_tau_s !== null ? `${num('damping_tau_s', sig(r.damping_tau_s, 3))} s` : missing, 'A / |dA/dt| at the median amplitude');
  add('damping model chosen', r.damping_model !== null ? esc(modelName(r.damping_model)) : missing, 'lowest criterion score among the fits');
  if (r.clock_drift_ppm_per_h !== null) add('clock drift', `${num('clock_drift_ppm_per_h', sig(r.clock_drift_ppm_per_h, 2))} ppm/h`, r.clock_span_s !== null ? `over ${duration(r.clock_span_s)} of heartbeats` : '');
  const sens = r.amplitude_sensitivity;
  if (sens !== null) {
    const at = `at ${fixed(sens.at_amplitude_deg, 1)}° amplitude`;
    add('amplitude change per mm of flag width', `${esc(sig(sens.per_width_deg_per_mm, 2))}°/mm`, at);
    add('amplitude change per µs of on/off delay difference', `${esc(sig(sens.per_delay_difference_deg_per_us, 2))}°/µs`, at);
  }
  add(
    'edge cleaning',
    `blocks under ${esc(sig(r.settings.glitch_s * 1e6, 3))} µs dropped; gaps under ${esc(sig(r.settings.bounce_s * 1e6, 3))} µs merged`,
    'glitch and bounce limits used',
  );
  for (const [k, v, ref] of [...planeRows(r), ...roomRows(r)]) add(k, v, ref);
  add('passes used / full periods', `${num('passes', String(r.passes))} / ${num('periods', String(r.periods))}`);
  return (
    `<section id="details"><h2>Further results</h2><table class="tbl"><tbody>` +
    rows.map(([k, v, ref]) => `<tr><th scope="row">${esc(k)}</th><td class="n">${v}</td><td class="ref">${esc(ref)}</td></tr>`).join('') +
    `</tbody></table></section>`
  );
}

/** A two-beam run's plane: the axis at the start and end, its turning rate beside Foucault's and Airy's, the largest minor axis. */
function planeRows(r: AnalysisResult): [string, string, string][] {
  const p = r.plane;
  if (!p) return [];
  const k = (name: keyof typeof p): string => `plane.${name}`;
  return [
    ['swing axis, first → last pass', `${num(k('azimuth_start_deg'), fixed(p.azimuth_start_deg, 1))}° → ${num(k('azimuth_end_deg'), fixed(p.azimuth_end_deg, 1))}°`, 'counterclockwise seen from above, from the rig’s reference direction'],
    ['precession of the swing plane', `${pm(p.precession_deg_per_h, p.precession_u_deg_per_h, k('precession_deg_per_h'), k('precession_u_deg_per_h'))} °/h`, 'slope of the unwrapped axis; + counterclockwise'],
    ['expected from the Earth’s rotation (Foucault)', p.foucault_deg_per_h !== null ? `${num(k('foucault_deg_per_h'), fixed(p.foucault_deg_per_h, 2))} °/h` : missing, p.foucault_deg_per_h !== null ? '−15.041 °/h · sin(latitude)' : 'needs latitude_deg in the rig file'],
    ['implied by the ellipse (Airy)', `${num(k('airy_deg_per_h'), sig(p.airy_deg_per_h, 3))} °/h`, 'mean of 3abω0/(8L²) over the passes'],
    ['largest minor axis', `${num('plane.minor_axis_max_mm', sig(p.minor_axis_max_m * 1000, 3))} mm`, 'the path’s offset from the crossing point'],
  ];
}

/** The room beside the swing (A records): what the board's sensor read and what it did to the length. */
function roomRows(r: AnalysisResult): [string, string, string][] {
  const e = r.environment;
  if (!e) return [];
  const k = (name: keyof typeof e): string => `environment.${name}`;
  const coeff =
    e.length_temp_coeff_ppm_per_K !== null
      ? `${pm(e.length_temp_coeff_ppm_per_K, e.length_temp_coeff_u_ppm_per_K, k('length_temp_coeff_ppm_per_K'), k('length_temp_coeff_u_ppm_per_K'))} ppm/K`
      : missing;
  return [
    ['room temperature, mean (min … max)', `${num(k('temperature_mean_C'), fixed(e.temperature_mean_C, 2))} °C (${num(k('temperature_min_C'), fixed(e.temperature_min_C, 2))} … ${num(k('temperature_max_C'), fixed(e.temperature_max_C, 2))})`, 'the board’s sensor, readings as sent'],
    ['air pressure and humidity, mean', `${num('environment.pressure_mean_hPa', fixed(e.pressure_mean_Pa / 100, 2))} hPa · ${num(k('humidity_mean_pct'), fixed(e.humidity_mean_pct, 1))} %RH`, ''],
    ['air density at the mean conditions', `${num(k('air_density_kg_m3'), fixed(e.air_density_kg_m3, 4))} kg/m³`, 'CIPM-2007, x_CO2 = 0.0004'],
    ['effective length’s temperature coefficient', coeff, e.length_temp_coeff_ppm_per_K !== null ? 'from the period’s drift against the temperature' : 'the temperature did not move enough to measure it'],
    ['reference temperature', `${num(k('reference_temperature_C'), fixed(e.reference_temperature_C, 2))} °C`, 'the mean of the readings; T0 holds there'],
  ];
}

/** What could not be computed and what the run or the rig file would need; empty when nothing is missing. */
export function missingSection(r: AnalysisResult, hasRig: boolean, reversiblePivot: 1 | 2 | null = null): string {
  const items: string[] = [];
  if (r.T0_s === null) items.push(`T0: needs full periods from every second pass; this journal gave ${r.passes} valid passes and ${r.periods} periods.`);
  if (r.g_m_s2 === null && reversiblePivot !== null && r.T0_s !== null)
    items.push(`g: a reversible pendulum needs both knife edges: time it about pivot ${reversiblePivot === 1 ? 2 : 1} too, then run halfswing combine on both journals.`);
  else if (r.g_m_s2 === null) items.push(hasRig ? 'g: needs T0 first.' : 'g: needs T0 and a rig description with the pendulum length.');
  if (r.B === null) items.push('B and C: the fit of period against amplitude needs periods over a range of amplitudes (a decay of several degrees).');
  if (r.damping_model === null) items.push('Damping and Q: need amplitudes over enough swings to see them decay.');
  if (r.gate_offset_m === null) items.push('Gate offset: needs consecutive half-periods and an amplitude.');
  if (r.clock_ppm === null && r.clock_source === 'host') items.push('Clock correction: needs heartbeats over a long enough run; the nominal rate was used.');
  if (items.length === 0) return '';
  return `<section class="missing" id="missing"><h2>Not computed</h2><ul>${items.map((i) => `<li>${esc(i)}</li>`).join('')}</ul></section>`;
}
