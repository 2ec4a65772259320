// The words of budget notes and correction notes (host/output/budget-words.ts): worked examples for every kind,
// the one ± rule on every worded value ± u (docs/references.md#ref-uncertainty-rounding: u to two significant
// digits, the value at u's place), and the same words in the summary, the report and analyze --json.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { BudgetNote, BudgetNoteKind } from '../../host/analysis/budget-note.ts';
import { budgetLineJson, correctionJson, noteText } from '../../host/output/budget-words.ts';
import { formatSummary } from '../../host/output/format-summary.ts';
import { analysisJson } from '../../host/output/result-json.ts';
import { renderReport } from '../../host/report/index.ts';
import { syntheticResult, syntheticRig } from '../report/fixture-result.ts';

// Inputs are the typed notes the analysis gave for seed 1 of the named bundled scenario (`sim/scenarios`) or
// session (`sim --session NAME --seed 1`, then `combine`) as of 5 Dec 2026 (later calibration work
// may move the runs' figures; these stay examples of the wording); the expected words apply the rule by hand.
const EXAMPLES: readonly { readonly from: string; readonly note: BudgetNote; readonly words: string }[] = [
  { from: 'demo-low-q', note: { kind: 'length', symbol: 'L', m: 0.6, u_m: 0.001 }, words: 'L = 0.6000 ± 0.0010 m' },
  { from: 'brass-1m-two-hours', note: { kind: 'length', symbol: 'L', m: 1, u_m: 0.0005 }, words: 'L = 1.00000 ± 0.00050 m' },
  { from: 'demo-low-q', note: { kind: 'flag-width', m: 0.03, u_m: 0.0002 }, words: 'w = 30.00 ± 0.20 mm' },
  {
    from: 'demo-low-q',
    note: { kind: 't0-line', passes: 277, white_s: 0.0001110158415953584, walk_s: 0.00007215114450676423 },
    words: 'line through 277 reduced pass times; white 111 µs, walk 72.2 µs per pass',
  },
  {
    from: 'night-run-faults',
    note: { kind: 't0-line', passes: 12824, white_s: 0.000002170772336444766, walk_s: 9.069099278373612e-7 },
    words: 'line through 12824 reduced pass times; white 2.17 µs, walk 0.907 µs per pass',
  },
  { from: 'demo-low-q', note: { kind: 'clock-rate', ppm: 120.02852140919205, u_ppm: 0.13261105369970821 }, words: '120.03 ± 0.13 ppm' },
  { from: 'night-run-faults', note: { kind: 'clock-rate', ppm: -19.50457324606525, u_ppm: 0.0023097238847869 }, words: '-19.5046 ± 0.0023 ppm' },
  { from: 'brass-1m-two-hours', note: { kind: 'clock-rate', ppm: 42.50025027796589, u_ppm: 0.005573050119676666 }, words: '42.5003 ± 0.0056 ppm' },
  {
    from: 'demo-low-q',
    note: { kind: 'delay-difference', source: 'run', s: -0.000008799225555736359, u_s: 0.00004817326862330247 },
    words: 'fitted from the run: -9 ± 48 µs',
  },
  // u = 127 µs: two digits are the tens, so the value −3.3 µs shows as 0.
  {
    from: 'plane-foucault-50n',
    note: { kind: 'delay-difference', source: 'run', s: -0.000003259948481679035, u_s: 0.0001274115172440127 },
    words: 'fitted from the run: 0 ± 130 µs',
  },
  { from: 'ideal-60deg', note: { kind: 'delay-difference', source: 'prior', s: 0, u_s: 0.000005 }, words: 'assumed 0.0 ± 5.0 µs (common practice, no source)' },
  { from: 'demo-low-q', note: { kind: 'bob-radius', m: 0.015 }, words: 'r = 15.0 mm' },
  { from: 'brass-1m-two-hours', note: { kind: 'string-to-bob-mass', ratio: 0.006858710562414266 }, words: 'm_s/M = 6.86e-3' },
  { from: 'night-run-faults', note: { kind: 'string-to-bob-mass', ratio: 0.011869436201780416 }, words: 'm_s/M = 0.0119' },
  { from: 'brass-1m-two-hours', note: { kind: 'air-to-bob-density', ratio: 0.00014117647058823528 }, words: 'ρ_air/ρ_bob = 1.41e-4' },
  { from: 'demo-low-q', note: { kind: 'q-measured', q: 184.6181929826618 }, words: 'Q = 185 measured' },
  { from: 'brass-1m-two-hours', note: { kind: 'q-measured', q: 4684.5761532814695 }, words: 'Q = 4680 measured' },
  { from: 'demo-low-q', note: { kind: 'not-applied', correction: 'air' }, words: 'not applied: no bob_density_kg_m3 (size shown for a steel bob; counted in the budget)' },
  { from: 'demo-low-q', note: { kind: 'not-applied', correction: 'string-mass' }, words: 'not applied: needs bob_mass_kg and string_mass_kg' },
  { from: 'a rig without bob_diameter_m', note: { kind: 'not-applied', correction: 'finite-bob' }, words: 'not applied: the rig gives no bob_diameter_m' },
  { from: 'a run too short for Q', note: { kind: 'not-applied', correction: 'damping' }, words: 'not applied: Q unknown' },
  { from: 'two-length-carbide', note: { kind: 'scale-reading', u_m: 0.000014142135623730951 }, words: 'each reading ± 14 µm (length_step_u_m/√2)' },
  { from: 'two-length-carbide', note: { kind: 'lengths', count: 2 }, words: '2 lengths' },
  { from: 'two-length-carbide', note: { kind: 'correction-fraction', fraction: 0.1 }, words: '10 % of each, taken together' },
  { from: 'reversible-bar', note: { kind: 'length', symbol: 'l', m: 0.9999988541849757, u_m: 0.00002 }, words: 'l = 0.999999 ± 0.000020 m' },
  {
    from: 'reversible-bar',
    note: { kind: 'centre-of-mass', m: 0.3729715195112494, u_m: 0.002, period_difference_s: 0.000514309758392173 },
    words: 'h1 − h2 = 0.3730 ± 0.0020 m; T1 − T2 = 514 µs',
  },
  // T1's statistics alone are 1.8 ns: the rule keeps two digits of it, ten decimals of the period.
  { from: 'reversible-bar', note: { kind: 'period', symbol: 'T1', s: 2.0053938240944262, u_s: 1.8298426084060434e-9 }, words: 'T1 = 2.0053938241 ± 0.0000000018 s' },
  {
    from: 'reversible-bar',
    note: { kind: 'both-pivots', pivot1_u_s: 0.000001513754839109604, pivot2_u_s: 0.0000013951096113046602 },
    words: '1.5 µs and 1.4 µs, taken together',
  },
  // The bundled bar's flag radii (0.5 mm on 1.08 m) on each pivot's period, seed 1.
  { from: 'reversible-bar', note: { kind: 'each-pivot', pivot1_u_s: 1.401456642001346e-7, pivot2_u_s: 1.291627641891593e-7 }, words: '0.14 µs and 0.13 µs, independent' },
  {
    from: 'reversible-bar',
    note: { kind: 'pivot-clocks', pivot1_u_s: 2.0639242467817898e-7, pivot2_u_s: 1.7523375857157014e-7, common_u_rel: 0 },
    words: '0.21 µs and 0.18 µs',
  },
  { from: 'tuning-bar', note: { kind: 'period', symbol: 'T', s: 2.005827847146916, u_s: 4.077371339720717e-7 }, words: 'T = 2.00582785 ± 0.00000041 s' },
  // No bundled scenario or session gives these kinds; illustrative inputs. α as the 8 h ±2 K run of
  // docs/references.md#ref-room-clock gave it; the reference temperature, clock and buoyancy figures are invented.
  {
    from: 'illustrative (α of the 8 h ±2 K run)',
    note: { kind: 'temperature-coefficient', per_K: 18.08e-6, u_per_K: 0.08e-6, reference_C: 20.374 },
    words: 'α = 18.080 ± 0.080 ppm/K to 20.37 °C',
  },
  { from: 'illustrative', note: { kind: 'length-carried', measured_C: 20, reference_C: 20.374 }, words: 'measured at 20.00 °C, carried 0.37 K' },
  { from: 'illustrative', note: { kind: 'common-clock', u_rel: 1.04e-7 }, words: 'common 0.10 ppm' },
  {
    from: 'illustrative',
    note: { kind: 'pivot-clocks', pivot1_u_s: 2.0432e-7, pivot2_u_s: 1.7452e-7, common_u_rel: 2.5e-8 },
    words: '0.20 µs and 0.17 µs; common 0.025 ppm',
  },
  { from: 'illustrative (steel bar)', note: { kind: 'buoyancy-difference', ratio: 1.5287e-4, g_rel: 7.93e-8 }, words: 'ρ_air·V/M = 1.53e-4, moves g by 7.93e-8' },
  { from: 'a run without a T0 line', note: { kind: 'periods', count: 12 }, words: '12 periods' },
];

describe('budget notes in words: worked examples', () => {
  for (const e of EXAMPLES)
    it(`${e.note.kind} (${e.from}): ${e.words}`, () => {
      expect(noteText(e.note)).toBe(e.words);
    });

  it('every kind has a worked example', () => {
    const kinds: Record<BudgetNoteKind, true> = {
      'bob-radius': true, 'string-to-bob-mass': true, 'air-to-bob-density': true, 'q-measured': true, 'not-applied': true, length: true,
      'flag-width': true, 't0-line': true, periods: true, 'clock-rate': true, 'delay-difference': true, 'temperature-coefficient': true,
      'length-carried': true, 'centre-of-mass': true, period: true, 'both-pivots': true, 'each-pivot': true, 'pivot-clocks': true, 'common-clock': true,
      'buoyancy-difference': true, 'scale-reading': true, lengths: true, 'correction-fraction': true,
    };
    expect(new Set(EXAMPLES.map((e) => e.note.kind))).toEqual(new Set(Object.keys(kinds)));
  });
});

/** Decimal places of a shown number (no exponent). */
const decimalsOf = (s: string): number => (s.includes('.') ? s.length - s.indexOf('.') - 1 : 0);
/** Significant digits of a shown uncertainty with `d` decimals ("0.0011" → 2; "120" at the tens place → 2). */
const digitsOf = (s: string, d: number): number => {
  const plain = s.replace('.', '').replace(/^0+/, '');
  return d >= 0 ? plain.length : plain.length + d;
};
/** Every "a ± b" pair in a text (numbers as the words print them, ASCII minus). */
const PAIR = /(-?\d+(?:\.\d+)?) ± (\d+(?:\.\d+)?)/g;

/** Checks one shown pair against the true value and u (in the shown unit), by the rule itself. */
function followsRule(shownV: string, shownU: string, v: number, u: number): void {
  const d = decimalsOf(shownU);
  // Numbers shown rounded to tens or more carry no decimals: infer the place from u's own magnitude.
  const place = d > 0 ? d : 1 - Math.floor(Math.log10(Number(shownU)));
  const step = 10 ** -Math.min(d, place);
  expect(digitsOf(shownU, d > 0 ? d : place)).toBe(2);
  expect(decimalsOf(shownV)).toBe(d);
  // Each shown number is the true one rounded at that place (half a step, and a little for binary fractions).
  expect(Math.abs(Number(shownU) - u)).toBeLessThanOrEqual(step / 2 + 1e-9 * step + Math.abs(u) * 1e-12);
  expect(Math.abs(Number(shownV) - v)).toBeLessThanOrEqual(step / 2 + 1e-9 * step + Math.abs(v) * 1e-12);
}

describe('budget notes in words: the one ± rule (property)', () => {
  // u from 1e-4 to 1e4 of the shown unit, values within a thousand u: no powers of ten in the shown numbers.
  const uShown = fc.double({ min: -4, max: 4, noNaN: true }).map((e) => 10 ** e);
  const rel = fc.double({ min: -1000, max: 1000, noNaN: true });

  it('every worded value ± u shows u to two significant digits and the value at its place', () => {
    const cases = fc.tuple(uShown, rel, fc.constantFrom('length', 'flag-width', 'clock-rate', 'delay-difference', 'temperature-coefficient', 'centre-of-mass', 'period'));
    fc.assert(
      fc.property(cases, ([u, k, kind]) => {
        const v = k * u;
        // Each kind with its scale to the shown unit (m, mm, ppm, µs, ppm/K, m, s).
        const [note, scale]: [BudgetNote, number] =
          kind === 'length' ? [{ kind, symbol: 'L', m: v, u_m: u }, 1]
          : kind === 'flag-width' ? [{ kind, m: v / 1e3, u_m: u / 1e3 }, 1e3]
          : kind === 'clock-rate' ? [{ kind, ppm: v, u_ppm: u }, 1]
          : kind === 'delay-difference' ? [{ kind, source: 'run', s: v / 1e6, u_s: u / 1e6 }, 1e6]
          : kind === 'temperature-coefficient' ? [{ kind, per_K: v / 1e6, u_per_K: u / 1e6, reference_C: 20 }, 1e6]
          : kind === 'centre-of-mass' ? [{ kind, m: v, u_m: u, period_difference_s: 1e-4 }, 1]
          : [{ kind: 'period', symbol: 'T', s: v, u_s: u }, 1];
        const pairs = [...noteText(note).matchAll(PAIR)];
        expect(pairs).toHaveLength(1);
        const [, sv, su] = pairs[0]!;
        const back = (x: number): number => (scale === 1 ? x : Number((x / scale).toPrecision(15)) * scale);
        followsRule(sv!, su!, back(v), back(u));
      }),
      { numRuns: 400 },
    );
  });

  it('an uncertainty worded alone shows two significant digits, rounded from it', () => {
    fc.assert(
      fc.property(uShown, (u) => {
        const words = noteText({ kind: 'both-pivots', pivot1_u_s: u / 1e6, pivot2_u_s: u / 1e6 });
        const shown = /^(\S+) µs and /.exec(words)![1]!;
        const d = decimalsOf(shown);
        const place = d > 0 ? d : 1 - Math.floor(Math.log10(Number(shown)));
        expect(digitsOf(shown, d > 0 ? d : place)).toBe(2);
        expect(Math.abs(Number(shown) - u)).toBeLessThanOrEqual(10 ** -place / 2 + u * 1e-12);
      }),
      { numRuns: 300 },
    );
  });
});

describe('one voice: the summary, the report and analyze --json word a note alike', () => {
  const r = syntheticResult();
  const words = r.budget.map((b) => noteText(b.note!));

  it('the fixture’s rows in words', () => {
    expect(words).toEqual(['L = 1.0000 ± 0.0010 m', `${r.periods} periods`, '-1234.50 ± 0.80 ppm']);
    expect(r.corrections.map((c) => noteText(c.why))).toEqual(['r = 12.7 mm', 'not applied: no bob_density_kg_m3 (size shown for a steel bob; counted in the budget)']);
  });

  it('the same words in each output; the JSON keeps its keys, in their place', () => {
    const summary = formatSummary(r, 'x.journal');
    const html = renderReport(r, { journalName: 'x.journal', journalSha256: '0'.repeat(64), rig: syntheticRig, csvName: null });
    const json = analysisJson(r) as { budget: Record<string, unknown>[]; corrections: Record<string, unknown>[] };
    for (const [i, w] of words.entries()) {
      expect(summary).toContain(`(${w})`);
      expect(html).toContain(`<td class="note">${w}</td>`);
      expect(json.budget[i]).toEqual({ ...r.budget[i], note: w });
      expect(Object.keys(json.budget[i]!)).toEqual(['id', 'name', 'u_rel_g', 'note']);
    }
    expect(json.corrections.map((c) => c.why)).toEqual(r.corrections.map((c) => noteText(c.why)));
    expect(Object.keys(json.corrections[0]!)).toEqual(Object.keys(r.corrections[0]!));
  });

  it('a row without a note has no note key in the JSON', () => {
    const row = { id: 'air' as const, name: 'air buoyancy and added mass (same bob throughout)', u_rel_g: 1e-6 };
    expect(budgetLineJson(row)).toEqual(row);
    expect('note' in budgetLineJson(row)).toBe(false);
    expect(correctionJson({ id: 'damping', name: 'damping', period_rel: 1e-9, applied: false, why: { kind: 'not-applied', correction: 'damping' } }).why).toBe('not applied: Q unknown');
  });
});
