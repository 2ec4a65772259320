// The analysis parts the benchmarks drive (host/pipeline/run-pipeline.ts), loaded at run time, typed here.
import type { AnalysisResult } from '../../host/analysis/result.ts';
import type { JournalEntry } from '../../protocol/journal.ts';
import type { Rig } from '../../protocol/rig.ts';
import { importPart } from './benchmark.ts';

export interface RunPipeline {
  push(entry: JournalEntry): void;
  live(): unknown;
  result(): AnalysisResult;
}

export interface PipelineApi {
  createRunPipeline(opts: { rig?: Rig; clock?: unknown }): RunPipeline;
}

export async function loadPipeline(): Promise<PipelineApi> {
  return importPart<PipelineApi>('host/pipeline/run-pipeline.ts', ['createRunPipeline']);
}

interface ReaderApi {
  readJournalFile(path: string): AsyncGenerator<JournalEntry>;
}

/** Reads a journal file through the host's reader into a run pipeline and computes the result. */
export async function analyzeJournal(file: string, opts: { rig?: Rig; clock?: unknown } = {}): Promise<{ entries: number; result: AnalysisResult; summary: Record<string, unknown> }> {
  const { createRunPipeline } = await loadPipeline();
  const { readJournalFile } = await importPart<ReaderApi>('host/journal/read-journal.ts', ['readJournalFile']);
  const p = createRunPipeline(opts);
  let entries = 0;
  for await (const e of readJournalFile(file)) {
    p.push(e);
    entries++;
  }
  const result = p.result();
  return { entries, result, summary: { T0_s: result.T0_s, g_m_s2: result.g_m_s2, passes: result.passes, periods: result.periods } };
}
