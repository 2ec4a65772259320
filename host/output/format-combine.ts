// `combine`'s text summary and its --json object (the keys of issue #17's contract, then the budget).
import type { Combined, ReversibleCombined, TwoLengthCombined } from '../analysis/combine.ts';
import type { BudgetLine } from '../analysis/result.ts';
import { budgetLineJson, noteText } from './budget-words.ts';
import { plusMinus, quoteU } from './value-u.ts';

/** The --json object: the contract's keys first, then the budget and the expected g. */
export function combineJson(c: Combined): Record<string, unknown> {
  const tail = { budget: c.budget.map(budgetLineJson), expected_g_m_s2: c.expected_g_m_s2 };
  if (c.method === 'two-length')
    return {
      method: c.method,
      g_m_s2: c.g_m_s2,
      g_u_m_s2: c.g_u_m_s2,
      length_offset_m: c.length_offset_m,
      length_offset_u_m: c.length_offset_u_m,
      journals: c.journals,
      ...tail,
      chi2: c.chi2,
      dof: c.dof,
    };
  return {
    method: c.method,
    g_m_s2: c.g_m_s2,
    g_u_m_s2: c.g_u_m_s2,
    ...(c.crossing_position_m !== undefined ? { crossing_position_m: c.crossing_position_m, crossing_position_u_m: c.crossing_position_u_m } : {}),
    journals: c.journals,
    ...(c.series ? { next_move_m: c.series.next_move_m } : {}),
    ...tail,
  };
}

const mm = (v: number, u: number): string => plusMinus(v * 1000, u * 1000, ' mm');

function budgetLines(rows: readonly BudgetLine[], extra: (b: BudgetLine) => string[] = () => []): string[] {
  const out = ['  uncertainty budget (relative standard uncertainty of g):'];
  for (const b of rows) out.push(`      ${b.u_rel_g.toExponential(2)}  ${b.name}${b.note ? ` (${noteText(b.note)})` : ''}`, ...extra(b));
  return out;
}

function gLines(c: Combined): string[] {
  const out = [`  g                ${quoteU(c.g_m_s2, c.g_u_m_s2, ' m/s²', { expanded: true })}`];
  out.push(`  relative u       ${(c.g_u_m_s2 / c.g_m_s2).toExponential(1)}`);
  if (c.expected_g_m_s2 !== null)
    out.push(`  expected g       ${c.expected_g_m_s2.toFixed(6)} m/s² (WGS-84 normal gravity; local anomalies are often ~1e-4 g): difference ${((c.g_m_s2 - c.expected_g_m_s2) / c.g_u_m_s2).toFixed(1)} σ`);
  return out;
}

function twoLengthText(c: TwoLengthCombined): string[] {
  const out = [`halfswing combine: two lengths, ${c.journals.length} journals of one bob`];
  out.push(...gLines(c));
  out.push(`  length offset    ${mm(c.length_offset_m, c.length_offset_u_m)}   (true pivot-to-bob-centre distance minus the scale's reading)`);
  for (const j of c.journals) out.push(`  ${j.file}: reading ${j.length_m} m, T0 ${plusMinus(j.T0_s, j.T0_u_s, ' s')}`);
  if (c.dof > 0) out.push(`  fit              χ² = ${c.chi2.toFixed(2)} on ${c.dof} degrees of freedom`);
  out.push(
    ...budgetLines(c.budget, (b) =>
      b.id === 'length-t0' ? c.t0_shares.map((s) => `          ${s.u_rel_g.toExponential(2)}  T0 at reading ${s.reading_m} m`) : [],
    ),
  );
  return out;
}

function reversibleText(c: ReversibleCombined): string[] {
  const kind = c.series ? `tuning series, ${c.journals.length} journals` : `reversible pendulum, ${c.journals.length} journals`;
  const out = [`halfswing combine: ${kind}`];
  out.push(...gLines(c));
  if (c.series && c.crossing_position_m !== undefined) {
    out.push(`  crossing         ${mm(c.crossing_position_m, c.crossing_position_u_m!)}   (mass position where T1 = T2; g is taken there)`);
    out.push(`  period there     ${plusMinus(c.series.T_s, c.series.T_u_s, ' s')}`);
    const move = c.series.next_move_m;
    const dir = move > 0 ? 'towards larger mass_position_m' : 'towards smaller mass_position_m';
    out.push(`  next             move the mass ${(Math.abs(move) * 1000).toFixed(2)} mm ${dir} (from ${c.series.last_position_m} m), then time both pivots again`);
  }
  if (c.pair) out.push(`  T1 − T2          ${((c.pair.T1_s - c.pair.T2_s) * 1e3).toFixed(4)} ms (the smaller, the less h1 − h2 matters)`);
  for (const j of c.journals)
    out.push(`  ${j.file}: pivot ${j.pivot}${j.mass_position_m !== undefined ? `, mass at ${j.mass_position_m} m` : ''}, T0 ${plusMinus(j.T0_s, j.T0_u_s, ' s')}`);
  out.push(...budgetLines(c.budget));
  return out;
}

/** The text summary (standard uncertainties, k = 1 unless labelled). */
export function formatCombine(c: Combined): string {
  return `${(c.method === 'two-length' ? twoLengthText(c) : reversibleText(c)).join('\n')}\n`;
}
