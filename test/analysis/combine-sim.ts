// Simulated sessions (two lengths, the reversible bar, a tuning series) combined in-process, against their truth.
import { combineLoaded, loadJournalEntries, type LoadedJournal } from '../../host/pipeline/combine-entries.ts';
import type { CombineOutcome } from '../../host/analysis/combine.ts';
import { combineFailureText } from '../../host/output/combine-words.ts';
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

/** How many of `seeds` put the truth inside ± 2u, and the rms of (value − truth)/u (1 when the budget is right). */
export function coverageOver(
  session: string,
  seeds: number,
  pick: (s: CombinedSession & { outcome: { ok: true } }) => { v: number; u: number; truth: number },
): { inside: number; rms: number } {
  let inside = 0;
  let z2 = 0;
  for (let seed = 1; seed <= seeds; seed++) {
    const s = combineSession(session, seed);
    if (!s.outcome.ok) throw new Error(combineFailureText(s.outcome.failure));
    const { v, u, truth } = pick(s as CombinedSession & { outcome: { ok: true } });
    if (Math.abs(v - truth) <= 2 * u) inside++;
    z2 += ((v - truth) / u) ** 2;
  }
  return { inside, rms: Math.sqrt(z2 / seeds) };
}
