// Test helper: a simulated run written as a journal file, analysed, and its report meta (name, SHA-256, rig).
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join } from 'node:path';
import { loadScenario, simulateJournal, type Truth } from '../../sim/index.ts';
import { analyzeJournalFile } from '../../host/pipeline/analyze-entries.ts';
import type { AnalysisResult } from '../../host/analysis/result.ts';
import type { ReportMeta } from '../../host/report/index.ts';

export interface SimRun {
  readonly dir: string;
  readonly journal: string;
  readonly truth: Truth;
  readonly result: AnalysisResult;
  readonly meta: ReportMeta;
}

/** Simulates `scenario` for `durationS` with `seed` into a fresh temp dir and analyses the journal file. */
export async function simulatedRun(scenario: string, seed: number, durationS: number): Promise<SimRun> {
  const dir = mkdtempSync(join(tmpdir(), 'halfswing-report-'));
  const journal = join(dir, `${scenario}-${seed}.journal`);
  const { lines, truth } = simulateJournal(loadScenario(scenario), { seed, durationS });
  writeFileSync(journal, [...lines].join('\n') + '\n');
  const { pipeline, result } = await analyzeJournalFile(journal);
  const sha = createHash('sha256').update(readFileSync(journal)).digest('hex');
  return { dir, journal, truth, result, meta: { journalName: basename(journal), journalSha256: sha, rig: pipeline.rig(), csvName: `${scenario}-${seed}.csv` } };
}
