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

/** Every run of a bundled session for one seed, each simulated for `durationS` (default: the scenario's); `measured`: journals state the rig as measured. */
export function combineSession(name: string, seed: number, durationS?: number, measured = false): CombinedSession {
  const { runs, truth } = sessionRuns(loadSession(name), seed, { measured_rig: measured });
  const loaded = runs.map((r) => {
    const { lines } = simulateJournal(r.scenario, { seed: r.seed, ...(durationS !== undefined ? { durationS } : {}) });
    const l = loadJournalEntries(r.name, [...lines].map(parseJournalLine));
    if (typeof l === 'string') throw new Error(l);
    return l;
  });
  return { truth, loaded, outcome: combineLoaded(loaded) };
}

type Picked = { v: number; u: number; truth: number };
type Pick = (s: CombinedSession & { outcome: { ok: true } }) => Picked;

/**
 * How many of `seeds` put the truth inside ± 2u, and the rms of (value − truth)/u (1 when the budget is right), for
 * each figure `picks` names; `measured`: the journals state the rig as measured (sim/measured-rig.ts).
 */
export function coverageOf<K extends string>(session: string, seeds: number, picks: Record<K, Pick>, measured = false): Record<K, { inside: number; rms: number; z: number[] }> {
  const z = Object.fromEntries(Object.keys(picks).map((k) => [k, [] as number[]])) as Record<K, number[]>;
  for (let seed = 1; seed <= seeds; seed++) {
    const s = combineSession(session, seed, undefined, measured);
    if (!s.outcome.ok) throw new Error(combineFailureText(s.outcome.failure));
    for (const k of Object.keys(picks) as K[]) {
      const { v, u, truth } = picks[k](s as CombinedSession & { outcome: { ok: true } });
      z[k].push((v - truth) / u);
    }
  }
  const out = {} as Record<K, { inside: number; rms: number; z: number[] }>;
  for (const k of Object.keys(picks) as K[])
    out[k] = { inside: z[k].filter((v) => Math.abs(v) <= 2).length, rms: Math.sqrt(z[k].reduce((a, v) => a + v * v, 0) / seeds), z: z[k] };
  return out;
}
