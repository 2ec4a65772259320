// The HTML run report: one self-contained XHTML-compatible page (inline CSS and SVG, no script, no network)
// drawn from the same AnalysisResult that `analyze --json` prints.
import { isSimpleRig } from '../../protocol/rig.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { periodRatio } from '../analysis/elliptic.ts';
import { esc } from './escape.ts';
import { headerSection } from './header-section.ts';
import { notesSection } from './notes-section.ts';
import { amplitudePlot, qPlot } from './plots/damping-plots.ts';
import { figure } from './plots/figure.ts';
import { periodPlot } from './plots/period-plot.ts';
import { planeTimePlot, planeTopView } from './plots/plane-plots.ts';
import { t0RoomPlot } from './plots/room-plots.ts';
import { alternationPlot, clockPlot, gRunningPlot } from './plots/timing-plots.ts';
import type { ReportMeta } from './report-meta.ts';
import { detailsTable, missingSection, resultBox } from './result-section.ts';
import { STYLES } from './styles.ts';
import { budgetTable, correctionsTable, countsSection, warningsSection } from './tables-section.ts';

export type { ReportMeta } from './report-meta.ts';

function plotsSection(r: AnalysisResult): string {
  const s = r.plots;
  const gate = r.gate_offset_m !== null ? ` The mean difference corresponds to a gate offset of ${((r.gate_offset_side === 'release' ? r.gate_offset_m : Math.abs(r.gate_offset_m)) * 1000).toFixed(2)} mm${r.gate_offset_side === 'release' ? ' (+ toward the release side)' : ' (its side is not known: the recording began mid-swing)'}.` : '';
  const clock = r.clock_ppm !== null ? ` The fitted rate error is ${r.clock_ppm.toFixed(1)} ppm.` : '';
  // The log-axis option works without script: a checkbox whose :checked state swaps the two drawings by CSS.
  const toggle = `<input type="checkbox" id="amp-log-toggle" class="toggle"/><label class="toggle-l" for="amp-log-toggle">logarithmic amplitude axis</label>`;
  const amp = `<div class="amp-lin">${amplitudePlot(r, s, 'linear')}</div><div class="amp-log">${amplitudePlot(r, s, 'log')}</div>`;
  const figs = [
    figure('fig-period', 1, 'Period against amplitude', 'Each full period (every second pass) at its measured amplitude, the exact law through the fitted T0, and the fit T0(1 + Bθ0² + Cθ0⁴); below, the data and the exact law minus that fit.', periodPlot(r, s, periodRatio)),
    figure('fig-amplitude', 2, 'Amplitude against time', 'Amplitude per swing from its transit time, with each damping fit started from the first swing; the chosen model is solid. The log axis turns exponential decay into a straight line.', amp, toggle),
    figure('fig-q', 3, 'Q against amplitude', 'Q = π·θ0/Δθ0 per cycle from the chosen damping fit; the diamond is the Q reported above.', qPlot(r, s)),
    figure('fig-alternation', 4, 'Half-period alternation', `Each swing’s two half-periods differ when the beam is off the lowest point: the difference (long minus short, by the side of the pass) stays on one side of zero and grows as the amplitude falls, about 4δ/(ω0·θ0) for a beam at angle δ from the lowest point; zero means a centred gate.${gate}`, alternationPlot(s)),
    figure('fig-clock', 5, 'Clock offset', `In each window of the run, the smallest host receive time minus device time of a heartbeat, about the line fitted through those minima, whose slope is the clock’s rate error. USB latency only ever adds delay, so the minima trace the lower envelope.${clock}`, clockPlot(r, s)),
    figure('fig-g', 6, 'Running estimate of g', 'g from the swings up to each time, with its expanded uncertainty band (k = 2).', gRunningPlot(r, s)),
  ];
  const roomText = s.room
    ? ' Below, the readings of the board’s room sensor as sent: a string that expands with the temperature lengthens the period by half its expansion.'
    : ' This run has no room readings (A records) to set beside it.';
  figs.push(
    figure('fig-t0-time', 7, s.room ? 'Reduced period and the room against time' : 'Reduced period against time', `The period reduced to zero amplitude by the exact law, averaged in windows of equal count, as parts per million from T0 (no other correction applied).${roomText}`, t0RoomPlot(r, s)),
  );
  if (s.plane && s.plane.t_s.length > 0) {
    figs.push(
      figure('fig-plane', 8, 'Swing plane', 'From the two crossed beams, at each pass: the direction of the swing’s axis and the ellipse’s signed minor axis (docs/two-beam-geometry.md). Passes within 20° of a beam line are not measured.', planeTimePlot(s.plane)),
      figure('fig-plane-top', 9, 'Top view', 'The ellipse of a few passes spread over the run, from their measured axis, semi-major and minor axes.', planeTopView(s.plane)),
    );
  }
  return `<section id="plots"><h2>Plots</h2>${figs.join('')}</section>`;
}

function footer(meta: ReportMeta): string {
  const csv = meta.csvName
    ? // A relative, percent-encoded link: a file name can never become a scheme ("javascript:") or a fragment.
      `The per-swing table is in <a href="./${esc(meta.csvName.split('/').map(encodeURIComponent).join('/'))}" data-key="csv">${esc(meta.csvName)}</a>.`
    : 'Run <code>halfswing analyze JOURNAL --csv FILE</code> for the per-swing table.';
  return `<footer id="footer"><p>${csv}</p><p>Made by halfswing from <code>${esc(meta.journalName)}</code> (SHA-256 ${esc(meta.journalSha256.slice(0, 16))}…). SI units; uncertainties are standard (k = 1) unless marked.</p></footer>`;
}

/** Renders the report page (a complete document, UTF-8, LF line ends). */
export function renderReport(result: AnalysisResult, meta: ReportMeta): string {
  const title = `Pendulum run report — ${meta.rig?.name ?? meta.journalName}`;
  return (
    `<!DOCTYPE html>\n<html xmlns="http://www.w3.org/1999/xhtml" lang="en"><head><meta charset="utf-8"/>` +
    `<meta name="viewport" content="width=device-width, initial-scale=1"/><title>${esc(title)}</title><style>${STYLES}</style></head>\n<body>\n` +
    [
      headerSection(result, meta),
      resultBox(result),
      missingSection(result, meta.rig !== null, meta.fileRig && !isSimpleRig(meta.fileRig) ? meta.fileRig.pivot : null),
      notesSection(result, meta.rig, periodRatio),
      detailsTable(result),
      plotsSection(result),
      budgetTable(result),
      correctionsTable(result),
      countsSection(result),
      warningsSection(result),
      footer(meta),
    ]
      .filter(Boolean)
      .join('\n') +
    `\n</body></html>\n`
  );
}
