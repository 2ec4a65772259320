// Runs a simulator scenario through the pipeline for truth tests: journal lines, truth, and the analysis.
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import type { Rig } from '../../protocol/rig.ts';
import { parseScenario, simulateJournal, type Scenario, type SimOptions, type Truth } from '../../sim/index.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import type { PipelineOptions } from '../../host/pipeline/run-pipeline.ts';
import type { AnalysisResult } from '../../host/analysis/result.ts';

/** A scenario from a plain object (validated by the simulator). */
export function scenario(value: unknown): Scenario {
  return parseScenario(value);
}

export interface SimRun {
  readonly entries: JournalEntry[];
  readonly truth: Truth;
  readonly result: AnalysisResult;
}

/** Simulates and analyses; `rig` replaces the journal's (true) rig, as a user's measured values would. */
export function simAndAnalyze(sc: Scenario, sim: SimOptions, opts: PipelineOptions & { rig?: Rig } = {}): SimRun {
  const { lines, truth } = simulateJournal(sc, sim);
  const entries = [...lines].map(parseJournalLine);
  return { entries, truth, result: analyzeEntries(entries, opts) };
}

/** Truth amplitude (rad) at host time t: the turning points around it, interpolated linearly in time. */
export function truthAmplitudeAt(truth: Truth, hostS: number): number {
  const t = hostS - truth.release_host_s;
  const ts = truth.swings.t_s;
  const th = truth.swings.theta_rad;
  let lo = 0;
  let hi = ts.length - 1;
  if (t <= ts[0]!) return Math.abs(th[0]!);
  if (t >= ts[hi]!) return Math.abs(th[hi]!);
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (ts[mid]! <= t) lo = mid;
    else hi = mid;
  }
  const f = (t - ts[lo]!) / (ts[hi]! - ts[lo]!);
  return Math.abs(th[lo]!) * (1 - f) + Math.abs(th[hi]!) * f;
}
