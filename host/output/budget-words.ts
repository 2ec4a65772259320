// The one table that turns the notes of budget rows and correction lines (host/analysis/budget-note.ts) into
// words: for the terminal summary, combine's summary, the reports, and the `note`/`why` strings of analyze --json
// and combine --json (same keys as before, now worded here). Rounding: a value with its uncertainty by the one ±
// rule (plusMinus, host/output/value-u.ts: u to two significant digits, the value at u's place); an uncertainty
// alone to two significant digits (uAlone); a value without one to three significant digits (powers of ten below
// 0.01); temperatures to the sensor's 0.01 K.
import type { BudgetNote, BudgetNoteKind } from '../analysis/budget-note.ts';
import type { BudgetLine, CorrectionId, CorrectionLine } from '../analysis/result.ts';
import { plusMinus, significant, uAlone } from './value-u.ts';

type Words = { readonly [K in BudgetNoteKind]: (n: Extract<BudgetNote, { kind: K }>) => string };

/** A value shown without an uncertainty: three significant digits, in powers of ten below 0.01 (ratios, Q, noise). */
export function three(x: number): string {
  const r = Number.isFinite(x) ? Number(x.toPrecision(3)) : x; // 4685 → 4690: significant() keeps whole digits
  return r !== 0 && Math.abs(r) < 0.01 ? r.toExponential(2) : significant(r, 3);
}

const us = (s: number): string => `${three(s * 1e6)} µs`;
const uUs = (s: number): string => uAlone(s * 1e6, ' µs');
const uPpm = (rel: number): string => uAlone(rel * 1e6, ' ppm');
const celsius = (c: number): string => `${c.toFixed(2)} °C`;

const NOT_APPLIED: { readonly [K in CorrectionId]: string } = {
  'finite-bob': 'the rig gives no bob_diameter_m',
  'string-mass': 'needs bob_mass_kg and string_mass_kg',
  air: 'no bob_density_kg_m3 (size shown for a steel bob; counted in the budget)',
  damping: 'Q unknown',
};

const WORDS: Words = {
  'bob-radius': (n) => `r = ${three(n.m * 1000)} mm`,
  'string-to-bob-mass': (n) => `m_s/M = ${three(n.ratio)}`,
  'air-to-bob-density': (n) => `ρ_air/ρ_bob = ${three(n.ratio)}`,
  'q-measured': (n) => `Q = ${three(n.q)} measured`,
  'not-applied': (n) => `not applied: ${NOT_APPLIED[n.correction]}`,
  length: (n) => `${n.symbol} = ${plusMinus(n.m, n.u_m, ' m')}`,
  'flag-width': (n) => `w = ${plusMinus(n.m * 1000, n.u_m * 1000, ' mm')}`,
  't0-line': (n) => `line through ${n.passes} reduced pass times; white ${us(n.white_s)}, walk ${us(n.walk_s)} per pass`,
  periods: (n) => `${n.count} periods`,
  'clock-rate': (n) => plusMinus(n.ppm, n.u_ppm, ' ppm'),
  'delay-difference': (n) =>
    n.source === 'run'
      ? `fitted from the run: ${plusMinus(n.s * 1e6, n.u_s * 1e6, ' µs')}`
      : `assumed ${plusMinus(n.s * 1e6, n.u_s * 1e6, ' µs')} (common practice, no source)`,
  'temperature-coefficient': (n) => `α = ${plusMinus(n.per_K * 1e6, n.u_per_K * 1e6, ' ppm/K')} to ${celsius(n.reference_C)}`,
  'length-carried': (n) => `measured at ${celsius(n.measured_C)}, carried ${(n.reference_C - n.measured_C).toFixed(2)} K`,
  'centre-of-mass': (n) => `h1 − h2 = ${plusMinus(n.m, n.u_m, ' m')}; T1 − T2 = ${us(n.period_difference_s)}`,
  period: (n) => `${n.symbol} = ${plusMinus(n.s, n.u_s, ' s')}`,
  'both-pivots': (n) => `${uUs(n.pivot1_u_s)} and ${uUs(n.pivot2_u_s)}, taken together`,
  'each-pivot': (n) => `${uUs(n.pivot1_u_s)} and ${uUs(n.pivot2_u_s)}, independent`,
  'pivot-clocks': (n) => `${uUs(n.pivot1_u_s)} and ${uUs(n.pivot2_u_s)}${n.common_u_rel > 0 ? `; common ${uPpm(n.common_u_rel)}` : ''}`,
  'common-clock': (n) => `common ${uPpm(n.u_rel)}`,
  'buoyancy-difference': (n) => `ρ_air·V/M = ${three(n.ratio)}, moves g by ${three(n.g_rel)}`,
  'scale-reading': (n) => `each reading ± ${uAlone(n.u_m * 1e6, ' µm')} (length_step_u_m/√2)`,
  lengths: (n) => `${n.count} lengths`,
  'correction-fraction': (n) => `${significant(n.fraction * 100, 2)} % of each, taken together`,
};

/** The words of one note. */
export function noteText(n: BudgetNote): string {
  return (WORDS[n.kind] as (x: BudgetNote) => string)(n);
}

/** A budget row as the --json outputs write it: its `note` worded (the key and its place unchanged). */
export type BudgetLineJson = Omit<BudgetLine, 'note'> & { readonly note?: string };

export function budgetLineJson(b: BudgetLine): BudgetLineJson {
  const { note, ...rest } = b;
  return note ? { ...rest, note: noteText(note) } : rest;
}

/** A correction line as analyze --json writes it: its `why` worded. */
export function correctionJson(c: CorrectionLine): Omit<CorrectionLine, 'why'> & { readonly why: string } {
  return { ...c, why: noteText(c.why) };
}
