// Simulated sessions (two lengths, the reversible bar, a tuning series) combined in-process, against their truth.
import { combineLoaded, loadJournalEntries, type LoadedJournal } from '../../host/pipeline/combine-entries.ts';
import type { CombineOutcome } from '../../host/analysis/combine.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadSession } from '../../sim/outlets/scenario-files.ts';
import { sessionRuns, type SessionTruth } from '../../sim/session.ts';
import { simulateJournal } from '../../sim/simulate.ts';

export interface CombinedSession {
  readonly truth: SessionTruth;
  readonly loaded: LoadedJournal[];
  readonly outcome: CombineOutcome;
}

/** Every run of a bundled session for one seed, each simulated for `durationS` (default: the scenario's). */
export function combineSession(name: string, seed: number, durationS?: number): CombinedSession {
  const { runs, truth } = sessionRuns(loadSession(name), seed);
  const loaded = runs.map((r) => {
    const { lines } = simulateJournal(r.scenario, { seed: r.seed, ...(durationS !== undefined ? { durationS } : {}) });
    const l = loadJournalEntries(r.name, [...lines].map(parseJournalLine));
    if (typeof l === 'string') throw new Error(l);
    return l;
  });
  return { truth, loaded, outcome: combineLoaded(loaded) };
}
