// combine's refusals: the core says why as data (host/analysis/combine-failure.ts), host/output/combine-words.ts
// gives the one line. Worked examples of every kind; the CLI's own refusals are in analysis-cli-combine.test.ts.
import { describe, expect, it } from 'vitest';
import type { CombineFailure, CombineFailureKind } from '../../host/analysis/combine-failure.ts';
import { combineRuns } from '../../host/analysis/combine.ts';
import { combineFailureText } from '../../host/output/combine-words.ts';

const A = 'two-length-carbide-01.journal';
const B = 'two-length-carbide-02.journal';
const EXAMPLES: readonly [CombineFailure, string][] = [
  [{ kind: 'too-few-journals', count: 1 }, 'combine needs two or more journals (got 1): two lengths of one bob, or a reversible pendulum about both knife edges'],
  [{ kind: 'too-few-passes', file: A, passes: 2 }, `${A} has too few passes for a period (2 passes): record a longer run, then combine again`],
  [{ kind: 'mixed-pendulums', ordinary: A, reversible: 'bar.journal' }, `${A} is an ordinary pendulum and bar.journal a reversible one: combine journals of one kind`],
  [
    { kind: 'different-bobs', first: A, other: B, key: 'bob_mass_kg', values: [0.0729, undefined] },
    `${A} and ${B} have different bobs (bob_mass_kg 0.0729 and not given): the two-length method needs the same bob at every length`,
  ],
  [{ kind: 'one-length', length_m: 1.2 }, 'every journal reads length_m 1.2: the two-length method needs at least two different lengths'],
  [
    { kind: 'no-length-step', file: B },
    `${B}: its rig gives no length_step_u_m (the standard uncertainty of a difference between two readings of the scale): add it to each rig with --rig or in the journal`,
  ],
  [{ kind: 'two-length-fit-failed' }, 'the two-length fit failed: the periods do not grow with the length readings (are the length_m values right?)'],
  [{ kind: 'no-period-at-length', file: B, length_m: 0.60612345 }, `${B} gives no period when reduced at length 0.6061 m`],
  [
    { kind: 'different-bars', first: 'a.journal', other: 'b.journal', edge_distance_m: [1, 0.99], flag_width_m: [0.02, 0.02] },
    'a.journal and b.journal describe different bars (edge_distance_m 1 and 0.99, flag_width_m 0.02 and 0.02): combine journals of one bar',
  ],
  [{ kind: 'one-pivot', missing: 2 }, 'every journal swings about pivot 1: time the bar about pivot 2 too (turn it over), then combine both'],
  [{ kind: 'mass-position-missing', file: 'a.journal' }, 'a.journal gives no mass_position_m but other journals do: a tuning series needs the mass position of every journal'],
  [
    { kind: 'pivot-cm-distances-differ', pivot: 1, values: [0.6, 0.61] },
    'the journals about pivot 1 give different cm_distance_m (0.6, 0.61): a moved mass makes a tuning series, give each journal its mass_position_m',
  ],
  [{ kind: 'bessel-no-solution', h1_m: 0.4, h2_m: 0.4 }, "Bessel's formula has no solution here: h1 = 0.4 m and h2 = 0.4 m must differ (check cm_distance_m of both pivots)"],
  [{ kind: 'tuning-too-few-positions', pivot: 2, positions: 1 }, 'a tuning series needs at least two mass positions timed about pivot 2 (the journals give 1)'],
  [{ kind: 'tuning-too-few-points' }, 'a tuning series needs at least two mass positions per pivot, each with a period and its uncertainty'],
  [{ kind: 'tuning-no-crossing' }, 'T1 and T2 do not cross near the measured mass positions (their slopes are too alike): move the mass further'],
];

describe('combine refusals in words', () => {
  for (const [f, words] of EXAMPLES) it(f.kind, () => expect(combineFailureText(f)).toBe(words));

  it('every kind has an example, each one line', () => {
    const kinds = new Set<CombineFailureKind>(EXAMPLES.map(([f]) => f.kind));
    expect(kinds.size).toBe(16);
    for (const [f] of EXAMPLES) expect(combineFailureText(f)).not.toContain('\n');
  });

  it('the core returns the kind with its numbers, not words', () => {
    expect(combineRuns([], () => { throw new Error('not reduced'); })).toEqual({ ok: false, failure: { kind: 'too-few-journals', count: 0 } });
  });
});
