// The HTML report of `combine`: g and its budget, T0 per journal, T0² against the length readings with the fit,
// and for a tuning series T1 and T2 against the mass position with their crossing. Same page shell as a run report.
import type { Combined, ReversibleCombined, TwoLengthCombined } from '../analysis/combine.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { polyAt } from '../analysis/tuning-series.ts';
import { plusMinus, quoteU } from '../output/value-u.ts';
import { esc } from './escape.ts';
import { figure, linspace } from './plots/figure.ts';
import { STYLES } from './styles.ts';
import { renderChart, type SeriesSpec } from './svg/chart.ts';
import { budgetTable } from './tables-section.ts';

function resultBox(c: Combined): string {
  const rows: [string, string][] = [
    ['method', c.method === 'two-length' ? 'two lengths of one bob (only the differences of the readings count)' : c.crossing_position_m !== undefined ? "reversible pendulum, tuning series (g at the crossing T1 = T2)" : "reversible pendulum, Bessel's formula"],
    ['g', quoteU(c.g_m_s2, c.g_u_m_s2, ' m/s²', { expanded: true })],
  ];
  if (c.method === 'two-length') rows.push(['length offset', plusMinus(c.length_offset_m * 1000, c.length_offset_u_m * 1000, ' mm')]);
  if (c.method === 'reversible' && c.crossing_position_m !== undefined && c.series) {
    rows.push(['crossing', plusMinus(c.crossing_position_m * 1000, c.crossing_position_u_m! * 1000, ' mm')]);
    rows.push(['next', `move the mass ${(Math.abs(c.series.next_move_m) * 1000).toFixed(2)} mm towards ${c.series.next_move_m > 0 ? 'larger' : 'smaller'} mass_position_m`]);
  }
  if (c.expected_g_m_s2 !== null) rows.push(['expected g', `${c.expected_g_m_s2.toFixed(6)} m/s² (WGS-84 normal gravity)`]);
  return `<section id="result"><h2>Result</h2><table class="tbl">${rows.map(([k, v]) => `<tr><th scope="row">${esc(k)}</th><td data-key="${esc(k)}">${esc(v)}</td></tr>`).join('')}</table></section>`;
}

function journalsTable(c: Combined, results: readonly AnalysisResult[]): string {
  const head = c.method === 'two-length' ? '<th>length_m reading</th>' : '<th>pivot</th><th>mass position (m)</th>';
  const rows = c.journals.map((j, i) => {
    const r = results[i]!;
    const own = 'length_m' in j ? `<td class="n">${j.length_m}</td>` : `<td class="n">${j.pivot}</td><td class="n">${j.mass_position_m ?? '—'}</td>`;
    const amp = r.amplitude_start_deg !== null && r.amplitude_end_deg !== null ? `${r.amplitude_start_deg.toFixed(2)}° → ${r.amplitude_end_deg.toFixed(2)}°` : '—';
    return `<tr><th scope="row"><code>${esc(j.file)}</code></th>${own}<td class="n" data-key="T0_s">${esc(plusMinus(j.T0_s, j.T0_u_s, ' s'))}</td><td class="n">${esc(amp)}</td><td class="n">${r.passes}</td></tr>`;
  });
  return `<section id="journals"><h2>T0 per journal</h2><table class="tbl"><thead><tr><th>journal</th>${head}<th class="n">T0 (k = 1)</th><th class="n">amplitude</th><th class="n">passes</th></tr></thead><tbody>${rows.join('')}</tbody></table></section>`;
}

function lengthFigure(c: TwoLengthCombined): string {
  const x = c.journals.map((j) => j.length_m);
  const a = c.slope_s2_per_m;
  const xs = linspace(Math.min(...x), Math.max(...x), 50);
  const line = (v: number): number => a * (v + c.length_offset_m);
  const resid = c.T0_squared_s2.map((y, i) => (y - line(x[i]!)) * 1e6);
  const chart = renderChart({
    id: 'cmb-len',
    title: 'T0² against the length reading',
    xLabel: 'length_m reading (m)',
    panels: [
      {
        yLabel: 'T0² (s²)',
        weight: 2,
        series: [
          { kind: 'line', label: `weighted line, offset ${(c.length_offset_m * 1000).toFixed(3)} mm`, x: xs, y: xs.map(line), tone: 2 },
          { kind: 'points', label: 'corrected T0²', x, y: c.T0_squared_s2, shape: 'square', tone: 1 },
        ],
      },
      { yLabel: 'residual (1e-6 s²)', include: 0, series: [{ kind: 'points', label: '', x, y: resid, shape: 'square', tone: 1 }] },
    ],
  });
  return figure(
    'fig-length',
    1,
    'T0² against length',
    'Each journal’s T0² corrected to the equivalent simple pendulum (finite bob, string mass) at its reading; the weighted line’s slope is 4π²/g and where it meets T0² = 0 is minus the scale’s offset. Below, the points minus the line (in 1e-6 s²).',
    chart,
  );
}

function seriesFigure(c: ReversibleCombined): string {
  const s = c.series!;
  const pts = (p: 1 | 2): { x: number[]; y: number[] } => {
    const js = c.journals.filter((j) => j.pivot === p);
    return { x: js.map((j) => j.mass_position_m! * 1000), y: js.map((j) => j.T0_s) };
  };
  const all = c.journals.map((j) => j.mass_position_m!);
  const xc = c.crossing_position_m!;
  const xs = linspace(Math.min(...all, xc), Math.max(...all, xc), 60);
  const p1 = pts(1);
  const p2 = pts(2);
  const ys = [...p1.y, ...p2.y];
  const series: SeriesSpec[] = [
    { kind: 'line', label: 'fit T1', x: xs.map((v) => v * 1000), y: xs.map((v) => polyAt(s.fit1, v)), tone: 1 },
    { kind: 'line', label: 'fit T2', x: xs.map((v) => v * 1000), y: xs.map((v) => polyAt(s.fit2, v)), dash: '8 4', tone: 2 },
    { kind: 'points', label: 'T1 (pivot 1)', ...p1, shape: 'circle', tone: 1 },
    { kind: 'points', label: 'T2 (pivot 2)', ...p2, shape: 'triangle', tone: 2 },
    { kind: 'line', label: 'crossing', x: [xc * 1000, xc * 1000], y: [Math.min(...ys), Math.max(...ys)], dash: '3 3', tone: 4 },
  ];
  const chart = renderChart({ id: 'cmb-series', title: 'T1 and T2 against the mass position', xLabel: 'mass position (mm)', panels: [{ yLabel: 'T0 (s)', series }] });
  return figure(
    'fig-series',
    1,
    'T1 and T2 against the mass position',
    `The periods about each knife edge against where the movable mass sits, the fitted curves and their crossing at ${plusMinus(xc * 1000, c.crossing_position_u_m! * 1000, ' mm')}, where g = 4π²l/T² needs no centre-of-mass distance.`,
    chart,
  );
}

/** The report page (a complete document, UTF-8, LF line ends); `results` are the journals' analyses in the same order. */
export function renderCombineReport(c: Combined, results: readonly AnalysisResult[]): string {
  const title = `Combined pendulum report — ${c.method}, ${c.journals.length} journals`;
  const figs = c.method === 'two-length' ? [lengthFigure(c)] : c.series ? [seriesFigure(c)] : [];
  return (
    `<!DOCTYPE html>\n<html xmlns="http://www.w3.org/1999/xhtml" lang="en"><head><meta charset="utf-8"/>` +
    `<meta name="viewport" content="width=device-width, initial-scale=1"/><title>${esc(title)}</title><style>${STYLES}</style></head>\n<body>\n` +
    [
      `<header id="run"><h1>${esc(title)}</h1></header>`,
      resultBox(c),
      journalsTable(c, results),
      figs.length ? `<section id="plots"><h2>Plots</h2>${figs.join('')}</section>` : '',
      budgetTable(c),
      `<footer id="footer"><p>Made by halfswing combine; each journal reduced as <code>halfswing analyze</code> does it. SI units; uncertainties are standard (k = 1) unless marked.</p></footer>`,
    ]
      .filter(Boolean)
      .join('\n') +
    `\n</body></html>\n`
  );
}
