// `halfswing analyze`: a journal → summary, JSON, per-swing CSV and HTML report; all outputs or none are written.
import { analysisJson } from '../../output/result-json.ts';
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { basename, dirname, relative, resolve, sep } from 'node:path';
import { assumedNote, isSimpleRig, swingView } from '../../../protocol/rig.ts';
import { reversibleRunResult } from '../../analysis/reversible-result.ts';
import { formatSummary } from '../../output/format-summary.ts';
import { swingsCsvChunks } from '../../output/swings-csv.ts';
import { analyzeJournalFile } from '../../pipeline/analyze-entries.ts';
import type { ClockOption } from '../../pipeline/clock-choice.ts';
import { optString, type Command } from '../command.ts';
import { UserError } from '../../errors.ts';
import { loadRigFile } from '../rig-file.ts';
import { guardOutputs, writeWhole, type InputRef, type PlannedOutput } from '../../files/safe-output.ts';

/** Parses `--clock`: host, pps, nominal, or a rate error in ppm. */
export function parseClockOption(s: string | undefined): ClockOption {
  if (s === undefined) return undefined;
  if (s === 'host' || s === 'pps' || s === 'nominal') return s;
  const v = Number(s);
  if (s.trim() !== '' && Number.isFinite(v) && Math.abs(v) < 1e5) return v;
  throw new UserError(`--clock must be host, pps, nominal or a rate error in ppm (e.g. -35.2), not '${s}'`, 2);
}

async function sha256(path: string): Promise<string> {
  const h = createHash('sha256');
  for await (const chunk of createReadStream(path)) h.update(chunk as Buffer);
  return h.digest('hex');
}

/** Standard input as latin1 chunks, hashed as they pass, so the report can still name the journal's SHA-256. */
async function* hashed(input: AsyncIterable<string | Buffer>, h: ReturnType<typeof createHash>): AsyncGenerator<Buffer> {
  for await (const c of input) {
    const b = typeof c === 'string' ? Buffer.from(c, 'latin1') : c;
    h.update(b);
    yield b;
  }
}

/** Refuses, before any reading, outputs that would land on an input (journal, stdin's file, rig) or a journal. */
async function guardAnalyzeOutputs(cwd: string, journal: string | null, rigPath: string | undefined, csv: string | undefined, report: string | undefined): Promise<void> {
  const planned: PlannedOutput[] = [];
  if (csv !== undefined) planned.push({ path: resolve(cwd, csv), flag: '--csv' });
  if (report !== undefined) planned.push({ path: resolve(cwd, report), flag: '--report' });
  const inputs: InputRef[] = [journal === null ? { fd: 0, label: 'on standard input' } : { path: journal }];
  if (rigPath !== undefined) inputs.push({ path: resolve(cwd, rigPath) });
  await guardOutputs(planned, inputs);
}

export const command: Command = {
  name: 'analyze',
  summary: 'analyse a journal: period vs amplitude, T0, g with uncertainty, Q',
  usage: 'analyze JOURNAL|- [--rig FILE] [--json] [--csv FILE] [--report FILE.html] [--clock host|pps|nominal|PPM]',
  positionals: [1, 1],
  options: {
    rig: { type: 'string', arg: 'FILE', description: "rig description (JSON); default: the journal's #rig line" },
    json: { type: 'boolean', description: 'print one JSON object (SI units, standard uncertainties) instead of the summary' },
    csv: { type: 'string', arg: 'FILE', description: 'write one row per pass: time, transit, half-period, period, amplitude, reduced period, flags; swing plane and room when measured (docs/swings-csv.md)' },
    report: { type: 'string', arg: 'FILE', description: 'write the HTML run report' },
    clock: { type: 'string', arg: 'MODE', description: 'device clock correction: host (lower envelope of heartbeats), pps, nominal, or a rate error in ppm (default: pps if present, else host when the run is long enough)' },
  },
  details: `
The analysis is the same as the live view's: passes from the beam edges, full periods from every second pass,
amplitude from the exact transit-time integral, reduction to zero amplitude with T/T0 = 2K(sin²(θ0/2))/π, and
g = 4π²L_eff/T0² with the uncertainty budget. Uncertainties are standard (k = 1) unless marked k = 2.`,
  async run(args, io) {
    const fromStdin = args.positionals[0] === '-';
    const journal = fromStdin ? 'standard input' : resolve(io.cwd, args.positionals[0]!);
    if (fromStdin && io.stdin.isTTY) throw new UserError("analyze -: standard input is a terminal; pipe a journal in, e.g. 'halfswing sim --duration 10m | halfswing analyze -'", 2);
    const clock = parseClockOption(optString(args, 'clock'));
    const rigPath = optString(args, 'rig');
    // The note on assumed uncertainties comes once, below, for the rig actually used (file or journal).
    const rig = rigPath !== undefined ? loadRigFile(rigPath, io.cwd, () => {}) : undefined;
    const csvPath = optString(args, 'csv');
    const reportPath = optString(args, 'report');
    await guardAnalyzeOutputs(io.cwd, fromStdin ? null : journal, rigPath, csvPath, reportPath);
    const stdinHash = createHash('sha256');
    const input = fromStdin ? hashed(io.stdin as AsyncIterable<string | Buffer>, stdinHash) : undefined;
    const { pipeline, result: full } = await analyzeJournalFile(journal, { ...(rig ? { rig: swingView(rig) } : {}), clock, rows: csvPath !== undefined }, input);
    const fileRig = rig ?? pipeline.journalRig();
    const result = fileRig && !isSimpleRig(fileRig) ? reversibleRunResult(full, fileRig) : full;
    if (result.passes + result.counts.rejected_passes + (result.counts.unsequenced_passes ?? 0) === 0)
      throw new UserError(`${args.positionals[0]} has no passes of the pendulum (is the gate on channel ${pipeline.rig()?.beams[0].channel ?? 0}, and did the bob swing?)`);
    const name = fromStdin ? 'standard input' : basename(journal);
    const files: { path: string; chunks: Iterable<string> }[] = [];
    if (csvPath !== undefined) files.push({ path: resolve(io.cwd, csvPath), chunks: swingsCsvChunks(result.swings) });
    if (reportPath !== undefined) {
      const journalSha256 = fromStdin ? stdinHash.digest('hex') : await sha256(journal);
      const csvName = csvPath !== undefined ? csvLinkFrom(resolve(io.cwd, reportPath), resolve(io.cwd, csvPath)) : null;
      // Loaded only when asked for: the report's code is a third of what `analyze --json` would otherwise load.
      const { renderReport } = await import('../../report/index.ts');
      files.push({ path: resolve(io.cwd, reportPath), chunks: [renderReport(result, { journalName: name, journalSha256, rig: pipeline.rig(), fileRig, csvName })] });
    }
    await writeWhole(files);
    // Beside the summary only: --json is read by programs, and its budget rows carry the assumed values.
    const used = pipeline.rig();
    const note = used && args.values.json !== true ? assumedNote(used) : null;
    if (note) io.stderr.write(`halfswing: note: ${note}\n`);
    if (args.values.json === true) {
      io.stdout.write(`${JSON.stringify(analysisJson(result))}\n`);
    } else io.stdout.write(formatSummary(result, name));
    // The "wrote" lines go to stderr when stdout carries JSON for another program.
    const notes = args.values.json === true ? io.stderr : io.stdout;
    if (csvPath !== undefined) notes.write(`halfswing analyze: wrote ${csvPath} (${result.swings.length} rows)\n`);
    if (reportPath !== undefined) notes.write(`halfswing analyze: wrote ${reportPath}\n`);
    return 0;
  },
};

/** The CSV's path as seen from the report's folder, with / separators, so the report's link works wherever both were written. */
function csvLinkFrom(reportFile: string, csvFile: string): string {
  return relative(dirname(reportFile), csvFile).split(sep).join('/');
}
