// `halfswing combine`: several journals → g without the tape measure (two lengths, or a reversible pendulum).
// Each journal is reduced by the same pipeline as `analyze`; the combining is host/analysis/combine.ts.
import { basename, resolve } from 'node:path';
import type { JournalEntry } from '../../../protocol/journal.ts';
import type { Combined } from '../../analysis/combine.ts';
import { UserError } from '../../errors.ts';
import { guardOutputs, writeWhole } from '../../files/safe-output.ts';
import { readJournalBatches } from '../../journal/read-journal.ts';
import { combineFailureText } from '../../output/combine-words.ts';
import { combineJson, formatCombine } from '../../output/format-combine.ts';
import { combineLoaded, loadJournalEntries, type LoadedJournal } from '../../pipeline/combine-entries.ts';
import { optNumber, optString, type Command, type CommandIo } from '../command.ts';

/** One status line on stderr, rewritten in place on a terminal; `done` clears it. */
function statusLine(io: CommandIo): { show: (s: string) => void; done: () => void } {
  const tty = io.stderr.isTTY === true;
  return {
    show: (s) => io.stderr.write(tty ? `\r\x1b[2K${s}` : `${s}\n`),
    done: () => {
      if (tty) io.stderr.write('\r\x1b[2K');
    },
  };
}

/** Reads a journal into memory and reduces it exactly as `analyze` does. */
async function loadJournal(file: string, cwd: string, stepU: number | undefined): Promise<LoadedJournal> {
  const entries: JournalEntry[] = [];
  for await (const batch of readJournalBatches(resolve(cwd, file))) for (const e of batch) entries.push(e);
  const loaded = loadJournalEntries(file, entries, stepU);
  if (typeof loaded === 'string') throw new UserError(loaded);
  return loaded;
}

/** The HTML report, loaded only when asked for. */
async function reportHtml(c: Combined, loaded: readonly LoadedJournal[]): Promise<string> {
  const { renderCombineReport } = await import('../../report/combine-report.ts');
  return renderCombineReport(c, loaded.map((l) => l.result));
}

export const command: Command = {
  name: 'combine',
  summary: 'g from several journals: two lengths of one bob, or a reversible pendulum about both edges',
  usage: 'combine JOURNAL JOURNAL... [--json] [--report FILE.html] [--length-step-u M]',
  positionals: [1, 10000],
  options: {
    json: { type: 'boolean', description: 'print one JSON object (SI units, standard uncertainties) instead of the summary' },
    report: { type: 'string', arg: 'FILE', description: 'write the HTML report: T0 per journal, T0² against length, T1 and T2 against the mass position' },
    'length-step-u': { type: 'string', arg: 'M', description: "two lengths: the standard uncertainty of a difference of two readings of the scale (m), where the rigs give no length_step_u_m" },
  },
  details: `
The method comes from the journals' rigs. Ordinary pendulums with the same bob at different length_m readings
(one scale, unknown zero): a weighted fit of the corrected T0² against the readings gives g and the scale's
offset; each journal's amplitudes are solved again at its reading plus the fitted offset until it settles.
Reversible pendulums ("pendulum": "reversible") about both pivots: Bessel's formula; with mass_position_m in
every rig, a tuning series: T1 and T2 fitted against the mass position, their crossing, g there, and which way
to move the mass next. Each journal is reduced exactly as 'halfswing analyze' does it. Uncertainties are
standard (k = 1) unless marked k = 2.`,
  async run(args, io) {
    const files = args.positionals;
    const stepU = optNumber(args, 'length-step-u', { min: 0, max: 0.01 });
    const reportPath = optString(args, 'report');
    if (files.length < 2)
      throw new UserError(`combine needs two or more journals (got one: ${files[0]}): two lengths of one bob, or a reversible pendulum timed about both knife edges`, 2);
    if (reportPath !== undefined)
      await guardOutputs([{ path: resolve(io.cwd, reportPath), flag: '--report' }], files.map((f) => ({ path: resolve(io.cwd, f) })));
    const status = statusLine(io);
    const loaded: LoadedJournal[] = [];
    for (const [i, f] of files.entries()) {
      status.show(`halfswing combine: reducing ${i + 1}/${files.length} ${basename(f)}`);
      loaded.push(await loadJournal(f, io.cwd, stepU));
    }
    let pass = 1;
    const outcome = combineLoaded(loaded, (i, length_m) => {
      if (i === 0) pass++;
      status.show(`halfswing combine: reducing ${i + 1}/${files.length} ${basename(files[i]!)} again at ${length_m.toFixed(5)} m (pass ${pass})`);
    });
    status.done();
    if (!outcome.ok) throw new UserError(combineFailureText(outcome.failure));
    if (reportPath !== undefined) await writeWhole([{ path: resolve(io.cwd, reportPath), chunks: [await reportHtml(outcome.result, loaded)] }]);
    io.stdout.write(args.values.json === true ? `${JSON.stringify(combineJson(outcome.result))}\n` : formatCombine(outcome.result));
    if (reportPath !== undefined) (args.values.json === true ? io.stderr : io.stdout).write(`halfswing combine: wrote ${reportPath}\n`);
    return 0;
  },
};
