// Simulate a scenario and analyse its journal in memory: the product path (journal lines → pipeline) with truth beside it.
import type { AnalysisResult } from '../../host/analysis/result.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import type { PipelineOptions } from '../../host/pipeline/run-pipeline.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadScenario, parseScenario, simulateJournal, type Scenario, type SimOptions, type Truth } from '../../sim/index.ts';
import { join } from 'node:path';
import { REPO_ROOT } from './benchmark.ts';

/** Loads a scenario of test/bench/scenarios/ by name. */
export function benchScenario(name: string): Scenario {
  return loadScenario(join(REPO_ROOT, 'test', 'bench', 'scenarios', `${name}.json`));
}

/** A copy of a scenario whose true rig differs from the stated one (the stated rig goes to the analysis). */
export function withTrueRig(s: Scenario, rig: { length_m: number; flag_width_m: number }): Scenario {
  return parseScenario(JSON.parse(JSON.stringify({ ...s, rig: { ...s.rig, ...rig } })), s.name);
}

export function simulateAndAnalyze(s: Scenario, sim: SimOptions, pipe: PipelineOptions = {}): { result: AnalysisResult; truth: Truth } {
  const { lines, truth } = simulateJournal(s, sim);
  const result = analyzeEntries(
    (function* () {
      for (const line of lines) yield parseJournalLine(line);
    })(),
    pipe,
  );
  return { result, truth };
}
