// The uncertainty budget, the corrections considered, the fault counts and the warnings, as tables and lists.
import { noteText } from '../output/budget-words.ts';
import { warningText } from '../output/warning-words.ts';
import type { AnalysisResult, RunCounts } from '../analysis/result.ts';
import { esc } from './escape.ts';
import { fixed, sig } from './format.ts';

/** Relative values are shown in parts per million, to two significant figures. */
export function ppm(rel: number): string {
  return sig(rel * 1e6, 2);
}

function bar(share: number): string {
  const w = Math.max(0, Math.min(1, share)) * 80;
  return `<svg xmlns="http://www.w3.org/2000/svg" class="bar" width="84" height="10" viewBox="0 0 84 10" aria-hidden="true"><rect class="bar-bg" x="0" y="1" width="80" height="8"/><rect class="bar-fg" x="0" y="1" width="${w.toFixed(1)}" height="8"/></svg>`;
}

/** The GUM-style table: each input's contribution to u(g)/g and its share of the combined variance. */
export function budgetTable(r: Pick<AnalysisResult, 'budget' | 'g_m_s2' | 'g_u_m_s2'>): string {
  if (r.budget.length === 0) return `<section id="budget"><h2>Uncertainty budget</h2><p class="muted">No budget: g was not computed.</p></section>`;
  const sumSq = r.budget.reduce((a, b) => a + b.u_rel_g ** 2, 0);
  const rows = [...r.budget]
    .sort((a, b) => b.u_rel_g - a.u_rel_g)
    .map((b) => {
      const share = sumSq > 0 ? b.u_rel_g ** 2 / sumSq : 0;
      return `<tr data-budget="${esc(b.name)}"><th scope="row">${esc(b.name)}</th><td class="note">${esc(b.note ? noteText(b.note) : '')}</td><td class="n" data-key="u_rel_g">${esc(ppm(b.u_rel_g))}</td><td class="n">${share > 0 && share < 0.0005 ? '&lt; 0.1 %' : `${esc(fixed(share * 100, 1))} %`}</td><td>${bar(share)}</td></tr>`;
    });
  const combined =
    r.g_m_s2 !== null && r.g_u_m_s2 !== null
      ? `<tr class="sum"><th scope="row">combined standard uncertainty u(g)/g</th><td class="note">root sum of squares</td><td class="n" data-key="u_rel_combined">${esc(ppm(r.g_u_m_s2 / r.g_m_s2))}</td><td class="n">100 %</td><td></td></tr>` +
        `<tr class="sum"><th scope="row">expanded uncertainty U(g)/g, k = 2</th><td class="note"></td><td class="n">${esc(ppm((2 * r.g_u_m_s2) / r.g_m_s2))}</td><td></td><td></td></tr>`
      : '';
  return (
    `<section id="budget"><h2>Uncertainty budget</h2><table class="tbl budget"><thead><tr><th>input</th><th>value and standard uncertainty</th><th class="n">u(g)/g (ppm)</th><th class="n">share of u²</th><th></th></tr></thead>` +
    `<tbody>${rows.join('')}${combined}</tbody></table></section>`
  );
}

/** Each correction considered: its size, whether it was applied, and why. */
export function correctionsTable(r: AnalysisResult): string {
  if (r.corrections.length === 0) return `<section id="corrections"><h2>Corrections</h2><p class="muted">No corrections were considered (no T0).</p></section>`;
  const rows = r.corrections.map(
    (c) =>
      `<tr data-correction="${esc(c.name)}"><th scope="row">${esc(c.name)}</th><td class="n" data-key="period_rel">${esc(ppm(c.period_rel))}</td><td class="n">${esc(ppm(-2 * c.period_rel))}</td><td class="${c.applied ? 'yes' : 'no'}">${c.applied ? 'applied' : 'not applied'}</td><td class="note">${esc(noteText(c.why))}</td></tr>`,
  );
  return (
    `<section id="corrections"><h2>Corrections</h2><table class="tbl"><thead><tr><th>correction</th><th class="n">ΔT/T0 (ppm)</th><th class="n">effect on g (ppm)</th><th>status</th><th>why</th></tr></thead>` +
    `<tbody>${rows.join('')}</tbody></table><p class="small">g ∝ 1/T0², so a relative period change ΔT/T0 moves g by −2·ΔT/T0.</p></section>`
  );
}

const COUNT_LABELS: Record<keyof RunCounts, string> = {
  crc_errors: 'lines with a CRC error',
  bad_lines: 'other malformed lines',
  lines_lost: 'lines lost (sequence gaps)',
  device_lost: 'edges dropped by the device',
  rejected_passes: 'passes rejected',
  bridged_gaps: 'missing passes bridged',
  reboots: 'device restarts',
  disconnects: 'disconnects',
  unknown_kinds: 'records of unknown kind',
  glitches: 'glitches dropped',
  bounces: 'bounces merged',
  edge_resyncs: 'edge sequences resynchronised',
  unsequenced_passes: 'passes left out: too few in a row to tell one swing from the next, or the bob no longer cleared the beam',
  long_gaps: 'gaps too long to bridge',
  malformed_journal_lines: 'malformed journal lines',
};

/** The fault and health counts, non-zero ones marked. */
export function countsSection(r: AnalysisResult): string {
  const cells = (Object.keys(COUNT_LABELS) as (keyof RunCounts)[]).map((k) => {
    const v = r.counts[k];
    return `<div class="count${v > 0 ? ' nz' : ''}"><span class="count-v" data-count="${k}">${v}</span><span class="count-k">${esc(COUNT_LABELS[k])}</span></div>`;
  });
  return `<section id="counts"><h2>Faults and health</h2><div class="counts">${cells.join('')}</div></section>`;
}

/** The analysis warnings, or a line saying there are none. */
export function warningsSection(r: AnalysisResult): string {
  const body = r.warnings.length === 0 ? '<p class="muted">No warnings.</p>' : `<ul class="warn">${r.warnings.map((w) => `<li data-kind="${esc(w.kind)}">${esc(warningText(w))}</li>`).join('')}</ul>`;
  return `<section id="warnings"><h2>Warnings</h2>${body}</section>`;
}
