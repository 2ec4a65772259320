// The rig description (JSON): the physical facts about a pendulum and its gate that analysis needs.
// The keys, ranges and meanings live in protocol/rig-schema.ts; this module turns a file into a typed rig
// or into ONE line that says what is wrong and, where a unit mistake is likely, what to write instead.
import type { z } from 'zod';
import { MEASURES, REVERSIBLE_KEYS, SIMPLE_KEYS, reversibleRigSchema, simpleRigSchema, type Measure, type MeasureKey } from './rig-schema.ts';

/** One horizontal beam through the rest position (issue #16's contract). */
export interface Beam {
  readonly channel: number;
  /** Direction of the beam's normal, degrees counterclockwise seen from above, from the rig's reference direction. */
  readonly angle_deg: number;
}

/** Uncertainty keys that a rig may leave out; the analysis then assumes a value, and says so. */
export type AssumedKey = 'length_u_m' | 'flag_width_u_m';
export const ASSUMED_VALUES: Readonly<Record<AssumedKey, number>> = { length_u_m: 0.001, flag_width_u_m: 0.0002 };

interface RigCommon {
  readonly name?: string;
  /** Effective beam-blocking width (the ball's diameter for a beam through its centre). */
  readonly flag_width_m: number;
  readonly flag_width_u_m: number;
  readonly blocked_level: 'low' | 'high';
  /** Always at least one beam: a rig file without `beams` has one on its `channel` at angle 0. The first is the one a one-beam analysis times. */
  readonly beams: readonly [Beam] | readonly [Beam, Beam];
  readonly air_density_kg_m3: number;
  readonly latitude_deg?: number;
  readonly elevation_m?: number;
  /** Temperature at which the length was measured (issue #18). */
  readonly length_temp_C?: number;
  /**
   * The uncertainty keys the file left out, filled from ASSUMED_VALUES. Not enumerable: a parsed rig stays a
   * valid rig file (it can be parsed again), and a copy made by spreading counts its values as given.
   */
  readonly assumed?: readonly AssumedKey[];
}

/** A validated rig of the ordinary pendulum (a bob on a string), SI units, defaults filled in. */
export interface Rig extends RigCommon {
  readonly pendulum?: 'simple';
  /** Pivot to the bob's centre of mass. */
  readonly length_m: number;
  readonly length_u_m: number;
  /** Two-length method: standard uncertainty of a difference of two length readings (issue #17). */
  readonly length_step_u_m?: number;
  readonly bob_diameter_m?: number;
  readonly bob_mass_kg?: number;
  readonly string_mass_kg?: number;
  readonly bob_density_kg_m3?: number;
}

/** A validated rig of the reversible pendulum (issue #17's contract): no length_m. */
export interface ReversibleRig extends RigCommon {
  readonly pendulum: 'reversible';
  readonly pivot: 1 | 2;
  readonly edge_distance_m: number;
  readonly edge_distance_u_m: number;
  readonly cm_distance_m: number;
  readonly cm_distance_u_m: number;
  readonly flag_radius_m: number;
  /** Standard uncertainty of flag_radius_m; folded into the flag width's by swingView (the transit reads w/R). */
  readonly flag_radius_u_m?: number;
  readonly mass_position_m?: number;
  readonly body_volume_m3?: number;
  readonly body_mass_kg?: number;
}

export type AnyRig = Rig | ReversibleRig;

export type RigResult<R = AnyRig> = { readonly ok: true; readonly rig: R } | { readonly ok: false; readonly error: string };

/** True for the ordinary pendulum. */
export function isSimpleRig(rig: AnyRig): rig is Rig {
  return rig.pendulum !== 'reversible';
}

/** Validates a rig description (a parsed JSON value, or JSON text). Unknown keys are named, with the nearest known key. */
export function parseRig(input: unknown): RigResult {
  let value = input;
  if (typeof input === 'string') {
    try {
      value = JSON.parse(input);
    } catch (e) {
      return { ok: false, error: `rig is not valid JSON (${(e as Error).message})` };
    }
  }
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return { ok: false, error: 'rig must be a JSON object' };
  const obj = value as Record<string, unknown>;
  if (obj.pendulum !== undefined && obj.pendulum !== 'simple' && obj.pendulum !== 'reversible')
    return { ok: false, error: `pendulum must be "simple" or "reversible", not ${JSON.stringify(obj.pendulum)}` };
  const reversible = obj.pendulum === 'reversible';
  const keys = reversible ? REVERSIBLE_KEYS : SIMPLE_KEYS;
  const unknown = Object.keys(obj).find((k) => !keys.includes(k));
  if (unknown !== undefined) return { ok: false, error: unknownKeyMessage(unknown, reversible) };
  const parsed = (reversible ? reversibleRigSchema : simpleRigSchema).safeParse(obj, { reportInput: true });
  if (!parsed.success) return { ok: false, error: issueMessage(parsed.error.issues[0]!) };
  const rig = normalize(parsed.data);
  const wrong = crossCheck(rig, obj);
  return wrong === undefined ? { ok: true, rig } : { ok: false, error: wrong };
}

/** Like parseRig, for the callers that handle the ordinary pendulum only. */
export function parseSimpleRig(input: unknown): RigResult<Rig> {
  const r = parseRig(input);
  if (!r.ok || isSimpleRig(r.rig)) return r as RigResult<Rig>;
  return { ok: false, error: 'only an ordinary pendulum can be used here, not pendulum "reversible"' };
}

function normalize(data: z.output<typeof simpleRigSchema> | z.output<typeof reversibleRigSchema>): AnyRig {
  const { $schema: _schema, channel, beams, ...rest } = data;
  const filled: Record<string, unknown> = { ...rest };
  const assumed = (rest.pendulum === 'reversible' ? ['flag_width_u_m'] : ['length_u_m', 'flag_width_u_m']).filter((k) => filled[k] === undefined) as AssumedKey[];
  for (const k of assumed) filled[k] = ASSUMED_VALUES[k];
  const rig = { ...filled, beams: beams ?? [{ channel: channel ?? 0, angle_deg: 0 }] };
  if (assumed.length) Object.defineProperty(rig, 'assumed', { value: assumed, enumerable: false });
  return rig as unknown as AnyRig;
}

/** Checks that tie two keys together; one line, or undefined. */
function crossCheck(rig: AnyRig, given: Record<string, unknown>): string | undefined {
  if (given.channel !== undefined && given.beams !== undefined) return 'give either beams or channel, not both (beams replaces channel)';
  if (rig.beams.length === 2 && rig.beams[0].channel === rig.beams[1].channel) return `beams: both beams are on channel ${rig.beams[0].channel}; each beam needs its own channel`;
  const radius = isSimpleRig(rig) ? { key: 'length_m', v: rig.length_m } : { key: 'flag_radius_m', v: rig.flag_radius_m };
  // A flag wider than the radius keeps the beam blocked over more than ±30° of swing.
  if (rig.flag_width_m > radius.v) {
    const halfDeg = (Math.asin(Math.min(1, rig.flag_width_m / 2 / radius.v)) * 180) / Math.PI;
    return `flag_width_m ${rig.flag_width_m} is wider than a swing at ${radius.key} ${radius.v} can clear (the beam would stay blocked over ±${halfDeg.toFixed(0)}°)`;
  }
  const share = (key: string, u: number | undefined, of: string, v: number, most: number): string | undefined =>
    u !== undefined && u > most * v ? shareMessage(key, u, of, v, most) : undefined;
  if (isSimpleRig(rig)) {
    if (rig.bob_diameter_m !== undefined && rig.bob_diameter_m / 2 >= rig.length_m) return 'bob_diameter_m/2 must be smaller than length_m';
    const w = share('length_u_m', rig.length_u_m, 'length_m', rig.length_m, 0.1) ?? share('flag_width_u_m', rig.flag_width_u_m, 'flag_width_m', rig.flag_width_m, 0.5);
    if (w) return w;
    return undefined;
  }
  if (rig.cm_distance_m >= rig.edge_distance_m) return `cm_distance_m ${rig.cm_distance_m} must be less than edge_distance_m ${rig.edge_distance_m}: the centre of mass lies between the knife edges`;
  if ((rig.body_volume_m3 === undefined) !== (rig.body_mass_kg === undefined)) return 'body_volume_m3 and body_mass_kg go together (the air correction needs both)';
  return (
    share('edge_distance_u_m', rig.edge_distance_u_m, 'edge_distance_m', rig.edge_distance_m, 0.1) ??
    share('cm_distance_u_m', rig.cm_distance_u_m, 'cm_distance_m', rig.cm_distance_m, 0.5) ??
    share('flag_width_u_m', rig.flag_width_u_m, 'flag_width_m', rig.flag_width_m, 0.5)
  );
}

function shareMessage(key: string, u: number, of: string, v: number, most: number): string {
  const part = most === 0.1 ? 'a tenth' : 'half';
  const asMm = tidy(u * 1e-3);
  const hint = asMm <= most * v ? `; looks like millimetres: write ${asMm}` : '';
  return `${key} ${u} is more than ${part} of ${of} ${v}${hint}`;
}

/** A number without binary noise from scaling (812.5·1e-3 → 0.8125). */
function tidy(v: number): number {
  return Number(v.toPrecision(12));
}

function pathText(path: readonly PropertyKey[]): string {
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i ? '.' : ''}${String(p)}`)).join('');
}

function rangeMessage(key: string, m: Measure, v: number): string {
  for (const h of m.hints ?? []) {
    if (!h.when(v)) continue;
    const c = tidy(v * h.factor + (h.offset ?? 0));
    if ((m.aboveMin ? c > m.min : c >= m.min) && c <= m.max) return `${key} ${v} looks like ${h.unit}: write ${c}`;
  }
  return `${key} ${v} is outside ${m.aboveMin ? 'above ' : ''}${m.min} to ${m.max} ${m.unit}`;
}

/** One line for the first schema issue. */
function issueMessage(issue: z.core.$ZodIssue): string {
  const where = pathText(issue.path);
  const key = issue.path[issue.path.length - 1];
  const input = (issue as { input?: unknown }).input;
  switch (issue.code) {
    case 'invalid_type':
      if (input === undefined) return issue.path.length > 1 ? `${where} is missing` : `rig lacks required key "${where}"`;
      if (issue.expected === 'number' && typeof input === 'number') return `${where} must be a finite number`;
      return `${where} must be ${issue.expected === 'int' ? 'an integer' : `a ${issue.expected}`}, not ${JSON.stringify(input)}`;
    case 'too_big':
    case 'too_small':
      if (issue.origin === 'number' && typeof input === 'number' && typeof key === 'string' && key in MEASURES) return rangeMessage(where, MEASURES[key as MeasureKey], input);
      if (issue.origin === 'array') return `${where} must hold 1 or 2 beams`;
      if (issue.origin === 'string') return `${where} is too long`;
      return `${where} ${JSON.stringify(input)} is out of range (${issue.code === 'too_big' ? `at most ${String(issue.maximum)}` : `at least ${String(issue.minimum)}`})`;
    case 'invalid_value':
      return `${where} must be ${issue.values.map((v) => JSON.stringify(v)).join(' or ')}, not ${JSON.stringify(input)}`;
    case 'unrecognized_keys':
      return `unknown key "${issue.keys[0]}" in ${where || 'the rig'} (a beam has channel and angle_deg)`;
    default:
      return `${where}: ${issue.message}`;
  }
}

function unknownKeyMessage(k: string, reversible: boolean): string {
  const own = reversible ? REVERSIBLE_KEYS : SIMPLE_KEYS;
  const other = reversible ? SIMPLE_KEYS : REVERSIBLE_KEYS;
  if (reversible && k === 'length_m') return 'a reversible pendulum has no length_m: give edge_distance_m, cm_distance_m and flag_radius_m';
  if (other.includes(k))
    return reversible ? `${k} is not a key of a reversible pendulum` : `${k} belongs to a reversible pendulum: add "pendulum": "reversible" (and drop length_m)`;
  const near = nearestKey(k, own);
  return `unknown rig key "${k}"${near ? ` (did you mean "${near}"?)` : ''}`;
}

/** The known key closest to a typo (edit distance with transpositions), if it is close enough to be meant. */
export function nearestKey(typo: string, known: readonly string[]): string | undefined {
  let best: string | undefined;
  let bestD = Math.max(1, Math.floor(typo.length / 4)) + 1;
  for (const k of known) {
    const d = editDistance(typo.toLowerCase(), k);
    if (d < bestD) [best, bestD] = [k, d];
  }
  return best;
}

/** Optimal string alignment distance: insertions, deletions, substitutions and adjacent swaps each cost 1. */
function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let v = Math.min(d[i - 1]![j]! + 1, d[i]![j - 1]! + 1, d[i - 1]![j - 1]! + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) v = Math.min(v, d[i - 2]![j - 2]! + 1);
      d[i]![j] = v;
    }
  }
  return d[a.length]![b.length]!;
}

/**
 * Compact JSON of a rig for the journal's `#rig` line, in the schema's key order. Assumed values are left
 * out (so the journal still says they were not given), and a single beam at angle 0 is written as `channel`.
 */
export function rigJson(rig: AnyRig): string {
  const o: Record<string, unknown> = {};
  const src = rig as unknown as Record<string, unknown>;
  const plainBeam = rig.beams.length === 1 && rig.beams[0].angle_deg === 0;
  for (const k of isSimpleRig(rig) ? SIMPLE_KEYS : REVERSIBLE_KEYS) {
    if (k === '$schema' || k === (plainBeam ? 'beams' : 'channel') || (rig.assumed as readonly string[] | undefined)?.includes(k)) continue;
    const v = k === 'channel' ? rig.beams[0].channel : src[k];
    if (v !== undefined) o[k] = v;
  }
  return JSON.stringify(o);
}

/** One line telling which uncertainties were assumed, or null when the rig gives them all. */
export function assumedNote(rig: AnyRig): string | null {
  const a = rig.assumed ?? [];
  if (!a.length) return null;
  const what = a.map((k) => `${k} (${ASSUMED_VALUES[k] * 1000} mm assumed)`).join(' and ');
  return `the rig gives no ${what}; the uncertainty of g rests on ${a.length > 1 ? 'these guesses' : 'this guess'}: measure and write ${a.length > 1 ? 'them' : 'it'} in the rig file`;
}

/**
 * What the timing analysis of one journal needs of a rig, in the ordinary rig's shape: for a reversible pendulum the
 * flag's radius stands for the length (the amplitude is solved there) and there is no bob or string to correct for.
 */
export function swingView(rig: AnyRig): Rig {
  if (isSimpleRig(rig)) return rig;
  const { name, flag_width_m, flag_width_u_m, blocked_level, beams, air_density_kg_m3, latitude_deg, elevation_m } = rig;
  // The amplitude from a transit depends on the flag width over its radius only, so their relative errors add in quadrature.
  const u = Math.hypot(flag_width_u_m, (flag_width_m * (rig.flag_radius_u_m ?? 0)) / rig.flag_radius_m);
  const view: Rig = { flag_width_m, flag_width_u_m: u, blocked_level, beams, air_density_kg_m3, length_m: rig.flag_radius_m, length_u_m: 0 };
  return { ...view, ...(name !== undefined ? { name } : {}), ...(latitude_deg !== undefined ? { latitude_deg } : {}), ...(elevation_m !== undefined ? { elevation_m } : {}) };
}
