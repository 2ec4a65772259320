// The object `analyze --json` prints: the result without its per-swing rows (those go to --csv), the typed
// warnings with their words beside the data, the budget notes and correction reasons worded in place (same keys).
import type { AnalysisResult } from '../analysis/result.ts';
import { budgetLineJson, correctionJson } from './budget-words.ts';
import { warningJson } from './warning-words.ts';

export function analysisJson(result: AnalysisResult): Record<string, unknown> {
  const { swings: _rows, ...rest } = result;
  return { ...rest, warnings: rest.warnings.map(warningJson), budget: rest.budget.map(budgetLineJson), corrections: rest.corrections.map(correctionJson) };
}
