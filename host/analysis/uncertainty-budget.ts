// GUM-style combination of independent relative standard uncertainties (JCGM 100:2008, eq. 10 for uncorrelated inputs).
import type { BudgetLine } from './result.ts';

/** Combined relative standard uncertainty: the root sum of squares of the contributions. */
export function combineBudget(lines: readonly BudgetLine[]): number {
  let s = 0;
  for (const l of lines) if (Number.isFinite(l.u_rel_g)) s += l.u_rel_g * l.u_rel_g;
  return Math.sqrt(s);
}
