// `combine` over journals already in memory: each reduced by the same pipeline as `analyze` (its own #rig line),
// then combined by host/analysis/combine.ts, reducing a journal again where the two-length fixed point asks for it.
import { warningText } from '../output/warning-words.ts';
import type { JournalEntry } from '../../protocol/journal.ts';
import { isSimpleRig, type AnyRig, type Rig } from '../../protocol/rig.ts';
import { combineRuns, type CombineOutcome, type CombineRun } from '../analysis/combine.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { reversibleRunResult } from '../analysis/reversible-result.ts';
import { runEntries } from './analyze-entries.ts';

/** A journal held in memory with its rig and its first reduction. */
export interface LoadedJournal extends CombineRun {
  readonly entries: readonly JournalEntry[];
}

/** The pipeline over the entries, with the journal's own rig (null) or an ordinary rig in its place. */
function reduceWith(entries: readonly JournalEntry[], rig: Rig | null): { result: AnalysisResult; rig: AnyRig | null } {
  const { pipeline, result } = runEntries(entries, { rows: false, ...(rig ? { rig } : {}) });
  return { result, rig: rig ?? pipeline.journalRig() };
}

/**
 * Reduces one journal as `analyze` does; `stepU` fills length_step_u_m of an ordinary rig. Returns the journal or
 * one line saying why it cannot take part.
 */
export function loadJournalEntries(file: string, entries: readonly JournalEntry[], stepU?: number): LoadedJournal | string {
  const first = reduceWith(entries, null);
  if (!first.rig) {
    const bad = first.result.warnings.find((w) => w.kind === 'rig-line-unusable');
    const why = bad ? warningText(bad) : 'the journal has no #rig line';
    return `${file}: no usable rig (${why}); combine takes each journal's rig from its #rig line`;
  }
  const rig = stepU !== undefined && isSimpleRig(first.rig) ? { ...first.rig, length_step_u_m: stepU } : first.rig;
  return { file, entries, rig, result: isSimpleRig(rig) ? first.result : reversibleRunResult(first.result, rig) };
}

/** Combines loaded journals; `onReduce` hears of each second reduction (for a status line). */
export function combineLoaded(loaded: readonly LoadedJournal[], onReduce: (index: number, length_m: number) => void = () => {}): CombineOutcome {
  return combineRuns(loaded, (i, length_m) => {
    onReduce(i, length_m);
    return reduceWith(loaded[i]!.entries, { ...(loaded[i]!.rig as Rig), length_m }).result;
  });
}
