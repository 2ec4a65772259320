// Messages between the result client and its worker thread.
import type { JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult } from '../analysis/result.ts';

export type ToWorker =
  | { readonly type: 'push'; readonly entries: readonly JournalEntry[] }
  | { readonly type: 'reset' }
  | { readonly type: 'result'; readonly id: number; readonly rows: boolean };

export type FromWorker =
  | { readonly type: 'result'; readonly id: number; readonly result: AnalysisResult }
  | { readonly type: 'error'; readonly id: number; readonly message: string };
