// The report's header: what was measured, with which rig, when, and which journal file the numbers come from.
import type { AnalysisResult } from '../analysis/result.ts';
import { isSimpleRig, type AnyRig, type Rig } from '../../protocol/rig.ts';
import { esc } from './escape.ts';
import { duration, sig, valueU } from './format.ts';
import type { ReportMeta } from './report-meta.ts';

function row(k: string, v: string, key?: string): string {
  return `<div class="kv"><dt>${esc(k)}</dt><dd${key ? ` data-key="${esc(key)}"` : ''}>${v}</dd></div>`;
}

function mm(m: number): string {
  return sig(m * 1000, 4);
}

function withU(v: number, u: number, scale: number, unit: string): string {
  const f = valueU(v * scale, u * scale);
  return `${esc(f.value)}${f.u !== null ? ` ± ${esc(f.u)}` : ''} ${esc(unit)}`;
}

/** A reversible pendulum's own facts: its amplitudes are solved at the flag radius, which is no length of the pendulum. */
function reversibleRows(rig: AnyRig): string[] {
  if (isSimpleRig(rig)) return [];
  const rows = [
    row('pendulum', `reversible, swung about pivot ${rig.pivot}`, 'pivot'),
    row('knife-edge distance', withU(rig.edge_distance_m, rig.edge_distance_u_m, 1000, 'mm')),
    row('pivot to centre of mass', withU(rig.cm_distance_m, rig.cm_distance_u_m, 1000, 'mm')),
    row('flag radius', `${esc(mm(rig.flag_radius_m))} mm`, 'flag_radius'),
  ];
  if (rig.mass_position_m !== undefined) rows.push(row('mass position', `${esc(mm(rig.mass_position_m))} mm`));
  return rows;
}

/** The rig's facts as rows; optional facts appear only when the rig gives them. */
function rigRows(rig: Rig, fileRig: AnyRig | null | undefined): string[] {
  const own = fileRig ? reversibleRows(fileRig) : [];
  const rows = [...(own.length ? own : [row('pendulum length', withU(rig.length_m, rig.length_u_m, 1000, 'mm'))]), row('flag width', withU(rig.flag_width_m, rig.flag_width_u_m, 1000, 'mm'))];
  if (rig.bob_diameter_m !== undefined) rows.push(row('bob diameter', `${esc(mm(rig.bob_diameter_m))} mm`));
  if (rig.bob_mass_kg !== undefined) rows.push(row('bob mass', `${esc(sig(rig.bob_mass_kg * 1000, 4))} g`));
  if (rig.string_mass_kg !== undefined) rows.push(row('string mass', `${esc(sig(rig.string_mass_kg * 1000, 3))} g`));
  if (rig.bob_density_kg_m3 !== undefined) rows.push(row('bob density', `${esc(sig(rig.bob_density_kg_m3, 4))} kg/m³`));
  rows.push(row('air density', `${esc(sig(rig.air_density_kg_m3, 3))} kg/m³`));
  if (rig.latitude_deg !== undefined) rows.push(row('latitude', `${esc(sig(rig.latitude_deg, 6))}°`));
  if (rig.elevation_m !== undefined) rows.push(row('elevation', `${esc(sig(rig.elevation_m, 4))} m`));
  rows.push(row('gate', `channel ${rig.beams.map((b) => b.channel).join(' and ')}, beam blocked reads ${esc(rig.blocked_level)}`));
  return rows;
}

// In-page links only (fragments), so they work offline and in a saved copy.
const TOC: readonly (readonly [string, string])[] = [
  ['result', 'Result'],
  ['details', 'Further results'],
  ['plots', 'Plots'],
  ['budget', 'Uncertainty budget'],
  ['corrections', 'Corrections'],
  ['counts', 'Faults'],
  ['warnings', 'Warnings'],
];

/** The page header with the run facts and the journal's identity. */
export function headerSection(r: AnalysisResult, meta: ReportMeta): string {
  const name = meta.rig?.name;
  const run = [
    row('run start (UTC)', r.run.start_iso !== null ? esc(r.run.start_iso.replace('T', ' ').replace('Z', ' UTC')) : '<span class="muted">not recorded</span>', 'start'),
    row('duration', esc(duration(r.run.duration_s)), 'duration'),
    row('source', r.run.source !== null ? esc(r.run.source) : '<span class="muted">not recorded</span>', 'source'),
    row('firmware', r.run.firmware !== null ? esc(r.run.firmware) : '<span class="muted">no hello line seen</span>', 'firmware'),
    row('nominal tick rate', r.run.hz_nominal !== null ? `${esc(String(Number((r.run.hz_nominal / 1e6).toPrecision(9))))} MHz` : '<span class="muted">unknown</span>'),
    row('journal', `<code data-key="journal">${esc(meta.journalName)}</code>`),
    row('SHA-256', `<code class="hash" data-key="sha256">${esc(meta.journalSha256)}</code>`),
  ];
  const rig = meta.rig
    ? `<dl class="facts">${rigRows(meta.rig, meta.fileRig).join('')}</dl>`
    : '<p class="muted">No rig description: lengths, amplitudes and g need one (pass <code>--rig FILE</code> or record with it).</p>';
  return (
    `<header class="top"><p class="kicker">halfswing · pendulum run report</p>` +
    `<h1>${name ? esc(name) : 'Pendulum run'}</h1>` +
    `<nav class="toc">${TOC.map(([id, t]) => `<a href="#${id}">${t}</a>`).join(' ')}</nav>` +
    `<div class="cols"><section class="card" id="run"><h2>Run</h2><dl class="facts">${run.join('')}</dl></section>` +
    `<section class="card" id="rig"><h2>Rig</h2>${rig}</section></div></header>`
  );
}
