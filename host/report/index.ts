// The HTML run report (placeholder until the report lands): one self-contained page from an AnalysisResult.
import type { AnalysisResult } from '../analysis/result.ts';
import type { Rig } from '../../protocol/rig.ts';

/** Facts about the journal the report is tied to. */
export interface ReportMeta {
  readonly journalName: string;
  readonly journalSha256: string;
  readonly rig: Rig | null;
  readonly csvName: string | null;
}

/** Renders the report page. */
export function renderReport(result: AnalysisResult, meta: ReportMeta): string {
  return `<!DOCTYPE html><html><head><meta charset="utf-8"/><title>halfswing run report</title></head><body><pre>${JSON.stringify({ meta, result }, null, 1).replace(/&/g, '&amp;').replace(/</g, '&lt;')}</pre></body></html>\n`;
}
