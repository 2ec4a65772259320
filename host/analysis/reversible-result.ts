// One journal of a reversible pendulum: T0, amplitude, damping and Q as for any run, but no g (it needs both pivots).
import type { ReversibleRig } from '../../protocol/rig.ts';
import type { AnalysisResult, BudgetId } from './result.ts';

/** Rows of a single run's budget that belong to g from a length, not to T0. */
const LENGTH_ONLY: readonly BudgetId[] = ['length', 'finite-bob', 'string-mass', 'air'];

/** The result of one pivot's journal: g and what only g needs are taken out, and the summary says what to do. */
export function reversibleRunResult(r: AnalysisResult, rig: ReversibleRig): AnalysisResult {
  const other = rig.pivot === 1 ? 2 : 1;
  return {
    ...r,
    g_m_s2: null,
    g_u_m_s2: null,
    g_diff_sigma: null,
    L_eff_m: null,
    budget: r.budget.filter((b) => !LENGTH_ONLY.includes(b.id)),
    corrections: r.corrections.filter((c) => c.id === 'damping'),
    plots: { ...r.plots, gRunning: { t_s: [], g: [], g_u: [] } },
    warnings: [...r.warnings, { kind: 'reversible-other-pivot', pivot: rig.pivot, other }],
  };
}
