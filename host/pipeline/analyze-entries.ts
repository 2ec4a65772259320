// Batch entry points: run the pipeline over a list of journal entries, or over a journal file.
import type { JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { readJournalBatches } from '../journal/read-journal.ts';
import { createRunPipeline, type PipelineOptions, type RunPipeline } from './run-pipeline.ts';

/** Analyses entries in one go. */
export function analyzeEntries(entries: Iterable<JournalEntry>, opts: PipelineOptions = {}): AnalysisResult {
  return runEntries(entries, opts).result;
}

/** Like analyzeEntries, with the pipeline (for the rig it used and the journal's own); `rows: false`: no swing rows. */
export function runEntries(entries: Iterable<JournalEntry>, opts: PipelineOptions & { rows?: boolean } = {}): { pipeline: RunPipeline; result: AnalysisResult } {
  const p = createRunPipeline(opts);
  for (const e of entries) p.push(e);
  return { pipeline: p, result: p.result({ rows: opts.rows ?? true }) };
}

/**
 * Feeds a journal file (or, with `input`, a stream such as standard input, named `path` in messages) through a
 * pipeline and returns the pipeline (for its rig) and the result (`rows: false`: no swing rows).
 */
export async function analyzeJournalFile(
  path: string,
  opts: PipelineOptions & { rows?: boolean } = {},
  input?: AsyncIterable<string | Buffer>,
): Promise<{ pipeline: RunPipeline; result: AnalysisResult }> {
  const p = createRunPipeline(opts);
  for await (const batch of readJournalBatches(path, input)) for (const e of batch) p.push(e);
  return { pipeline: p, result: p.result({ rows: opts.rows ?? true }) };
}
