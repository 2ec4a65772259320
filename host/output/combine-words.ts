// The one line `combine` prints when it cannot combine the journals (host/analysis/combine-failure.ts): what is
// wrong and what to do, naming the files and the rig keys.
import type { CombineFailure, CombineFailureKind } from '../analysis/combine-failure.ts';

type Words = { readonly [K in CombineFailureKind]: (f: Extract<CombineFailure, { kind: K }>) => string };

const given = (v: number | undefined): string => (v === undefined ? 'not given' : String(v));

const WORDS: Words = {
  'too-few-journals': (f) => `combine needs two or more journals (got ${f.count}): two lengths of one bob, or a reversible pendulum about both knife edges`,
  'too-few-passes': (f) => `${f.file} has too few passes for a period (${f.passes} passes): record a longer run, then combine again`,
  'mixed-pendulums': (f) => `${f.ordinary} is an ordinary pendulum and ${f.reversible} a reversible one: combine journals of one kind`,
  'different-bobs': (f) =>
    `${f.first} and ${f.other} have different bobs (${f.key} ${given(f.values[0])} and ${given(f.values[1])}): the two-length method needs the same bob at every length`,
  'one-length': (f) => `every journal reads length_m ${f.length_m}: the two-length method needs at least two different lengths`,
  'no-length-step': (f) =>
    `${f.file}: its rig gives no length_step_u_m (the standard uncertainty of a difference between two readings of the scale): add it to each rig with --rig or in the journal`,
  'two-length-fit-failed': () => 'the two-length fit failed: the periods do not grow with the length readings (are the length_m values right?)',
  // A length with no uncertainty attached: to the 0.1 mm a scale is read to.
  'no-period-at-length': (f) => `${f.file} gives no period when reduced at length ${f.length_m.toFixed(4)} m`,
  'different-bars': (f) =>
    `${f.first} and ${f.other} describe different bars (edge_distance_m ${f.edge_distance_m[0]} and ${f.edge_distance_m[1]}, flag_width_m ${f.flag_width_m[0]} and ${f.flag_width_m[1]}): combine journals of one bar`,
  'one-pivot': (f) => `every journal swings about pivot ${f.missing === 1 ? 2 : 1}: time the bar about pivot ${f.missing} too (turn it over), then combine both`,
  'mass-position-missing': (f) => `${f.file} gives no mass_position_m but other journals do: a tuning series needs the mass position of every journal`,
  'pivot-cm-distances-differ': (f) =>
    `the journals about pivot ${f.pivot} give different cm_distance_m (${f.values.join(', ')}): a moved mass makes a tuning series, give each journal its mass_position_m`,
  'bessel-no-solution': (f) => `Bessel's formula has no solution here: h1 = ${f.h1_m} m and h2 = ${f.h2_m} m must differ (check cm_distance_m of both pivots)`,
  'tuning-too-few-positions': (f) => `a tuning series needs at least two mass positions timed about pivot ${f.pivot} (the journals give ${f.positions})`,
  'tuning-too-few-points': () => 'a tuning series needs at least two mass positions per pivot, each with a period and its uncertainty',
  'tuning-no-crossing': () => 'T1 and T2 do not cross near the measured mass positions (their slopes are too alike): move the mass further',
};

/** The one line of a refusal. */
export function combineFailureText(f: CombineFailure): string {
  return (WORDS[f.kind] as (x: CombineFailure) => string)(f);
}
