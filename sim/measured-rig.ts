// The rig as a user would measure it: each rig value the analysis reads that has a stated standard uncertainty,
// drawn from a normal distribution about the truth with that uncertainty, so that coverage tests exercise every
// input term of the uncertainty budget (the simulated physics keeps the true values).
import { isSimpleRig, parseRig, rigJson, type AnyRig } from '../protocol/rig.ts';

/** One drawn value: the truth, what the rig file says, and the standard uncertainty it was drawn with. */
export interface MeasuredDraw {
  readonly key: string;
  readonly true_value: number;
  readonly measured: number;
  readonly u: number;
}

export interface MeasuredRig {
  readonly rig: AnyRig;
  readonly draws: MeasuredDraw[];
}

/**
 * The measured keys and the key of their standard uncertainty. An uncertainty the file leaves out is the one the
 * analysis assumes (protocol/rig.ts ASSUMED_VALUES), since that is what its budget counts. Keys without a stated
 * uncertainty (bob mass, string mass, densities, latitude) stay true: no budget term claims to cover them.
 */
const SIMPLE_KEYS = [
  ['length_m', 'length_u_m'],
  ['flag_width_m', 'flag_width_u_m'],
] as const;
const REVERSIBLE_KEYS = [
  ['edge_distance_m', 'edge_distance_u_m'],
  ['cm_distance_m', 'cm_distance_u_m'],
  ['flag_radius_m', 'flag_radius_u_m'],
  ['flag_width_m', 'flag_width_u_m'],
] as const;

/** The keys drawn for a rig of this kind, with their uncertainty keys. */
export function measuredKeys(rig: AnyRig): readonly (readonly [string, string])[] {
  return isSimpleRig(rig) ? SIMPLE_KEYS : REVERSIBLE_KEYS;
}

/**
 * The rig as measured: value + u·normal(key) for each measured key (`normal` gives a standard normal per key, or 0
 * to keep a key true; a session passes the same number to every run that shares the measurement). A ball that is
 * its own flag (bob_diameter_m equal to flag_width_m) is one calliper reading: its diameter follows the flag width.
 * Throws when the drawn rig is not a valid rig (an uncertainty so large that a value leaves its range).
 */
export function drawMeasuredRig(rig: AnyRig, normal: (key: string) => number): MeasuredRig {
  const file = JSON.parse(rigJson(rig)) as Record<string, number>;
  const src = rig as unknown as Record<string, number | undefined>;
  const draws: MeasuredDraw[] = [];
  for (const [key, uKey] of measuredKeys(rig)) {
    const v = src[key];
    const u = src[uKey] ?? 0;
    const z = normal(key);
    if (v === undefined || u === 0 || z === 0) continue;
    file[key] = v + u * z;
    draws.push({ key, true_value: v, measured: file[key]!, u });
  }
  if (isSimpleRig(rig) && rig.bob_diameter_m !== undefined && rig.bob_diameter_m === rig.flag_width_m && file.flag_width_m !== rig.flag_width_m) {
    file.bob_diameter_m = file.flag_width_m!;
    draws.push({ key: 'bob_diameter_m', true_value: rig.bob_diameter_m, measured: file.bob_diameter_m, u: rig.flag_width_u_m });
  }
  const parsed = parseRig(file);
  if (!parsed.ok) throw new Error(`the rig as measured is not a valid rig: ${parsed.error}`);
  return { rig: parsed.rig, draws };
}

/** The draws that turn `truth` into `measured` (a rig as measured made elsewhere, e.g. by a session). */
export function drawsBetween(truth: AnyRig, measured: AnyRig): MeasuredDraw[] {
  const t = truth as unknown as Record<string, number | undefined>;
  const m = measured as unknown as Record<string, number | undefined>;
  const keys = [...measuredKeys(measured), ['bob_diameter_m', 'flag_width_u_m'] as const];
  return keys.flatMap(([key, uKey]) => {
    const tv = t[key];
    const mv = m[key];
    return tv !== undefined && mv !== undefined && tv !== mv ? [{ key, true_value: tv, measured: mv, u: m[uKey] ?? 0 }] : [];
  });
}
