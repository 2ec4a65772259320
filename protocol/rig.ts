// The rig description (JSON): the physical facts about a pendulum and its gate that analysis needs.

/** A validated rig description, SI units, defaults filled in. */
export interface Rig {
  /** Pivot to the bob's centre of mass. */
  readonly length_m: number;
  readonly length_u_m: number;
  /** Effective beam-blocking width (the ball's diameter for a beam through its centre). */
  readonly flag_width_m: number;
  readonly flag_width_u_m: number;
  readonly bob_diameter_m?: number;
  readonly blocked_level: 'low' | 'high';
  /** The pendulum's channel: the only beam's, or the first of `beams`. */
  readonly channel: number;
  /** One or two horizontal beams through the rest position (replaces `channel`; docs/two-beam-geometry.md). */
  readonly beams?: readonly Beam[];
  readonly bob_mass_kg?: number;
  readonly string_mass_kg?: number;
  readonly bob_density_kg_m3?: number;
  readonly air_density_kg_m3: number;
  readonly latitude_deg?: number;
  readonly elevation_m?: number;
  readonly name?: string;
}

/** A beam: its device channel and the direction of its normal, ° counterclockwise from above from the reference direction. */
export interface Beam {
  readonly channel: 0 | 1;
  readonly angle_deg: number;
}

export type RigResult = { readonly ok: true; readonly rig: Rig } | { readonly ok: false; readonly error: string };

type Kind = 'pos' | 'nonneg' | 'lat' | 'elev' | 'level' | 'channel' | 'text' | 'beams';
const FIELDS: Readonly<Record<keyof Rig, { kind: Kind; required?: true; def?: number | string }>> = {
  length_m: { kind: 'pos', required: true },
  length_u_m: { kind: 'nonneg', def: 0.001 },
  flag_width_m: { kind: 'pos', required: true },
  flag_width_u_m: { kind: 'nonneg', def: 0.0002 },
  bob_diameter_m: { kind: 'pos' },
  blocked_level: { kind: 'level', def: 'low' },
  channel: { kind: 'channel', def: 0 },
  beams: { kind: 'beams' },
  bob_mass_kg: { kind: 'pos' },
  string_mass_kg: { kind: 'nonneg' },
  bob_density_kg_m3: { kind: 'pos' },
  air_density_kg_m3: { kind: 'nonneg', def: 1.2 },
  latitude_deg: { kind: 'lat' },
  elevation_m: { kind: 'elev' },
  name: { kind: 'text' },
};

function check(key: string, kind: Kind, v: unknown): string | undefined {
  const num = typeof v === 'number' && Number.isFinite(v);
  switch (kind) {
    case 'pos':
      return num && (v as number) > 0 ? undefined : `${key} must be a number > 0`;
    case 'nonneg':
      return num && (v as number) >= 0 ? undefined : `${key} must be a number ≥ 0`;
    case 'lat':
      return num && Math.abs(v as number) <= 90 ? undefined : `${key} must be a number from -90 to 90`;
    case 'elev':
      return num && (v as number) > -500 && (v as number) < 9000 ? undefined : `${key} must be a number of metres from -500 to 9000`;
    case 'level':
      return v === 'low' || v === 'high' ? undefined : `${key} must be "low" or "high"`;
    case 'channel':
      return Number.isInteger(v) && (v as number) >= 0 && (v as number) <= 7 ? undefined : `${key} must be an integer 0 to 7`;
    case 'text':
      return typeof v === 'string' ? undefined : `${key} must be a string`;
    case 'beams':
      return checkBeams(key, v);
  }
}

function checkBeams(key: string, v: unknown): string | undefined {
  const shape = `${key} must be a list of 1 or 2 objects {"channel": 0 or 1, "angle_deg": number}`;
  if (!Array.isArray(v) || v.length < 1 || v.length > 2) return shape;
  for (const b of v as unknown[]) {
    if (typeof b !== 'object' || b === null || Array.isArray(b)) return shape;
    const o = b as Record<string, unknown>;
    if (Object.keys(o).some((k) => k !== 'channel' && k !== 'angle_deg')) return shape;
    if (o.channel !== 0 && o.channel !== 1) return `${key}: each channel must be 0 or 1`;
    if (typeof o.angle_deg !== 'number' || !Number.isFinite(o.angle_deg)) return `${key}: each angle_deg must be a number`;
  }
  if (v.length === 2 && (v[0] as Beam).channel === (v[1] as Beam).channel) return `${key}: the two beams must be on different channels`;
  return undefined;
}

/** Validates a rig description (a parsed JSON value, or JSON text). Unknown keys are errors that name the key. */
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
  const known = Object.keys(FIELDS);
  for (const k of Object.keys(obj)) {
    if (!known.includes(k)) {
      const near = known.find((n) => n.startsWith(k.slice(0, 4)));
      return { ok: false, error: `unknown rig key "${k}"${near ? ` (did you mean "${near}"?)` : ''}` };
    }
  }
  if (obj.beams !== undefined && obj.channel !== undefined) return { ok: false, error: 'rig has both "beams" and "channel": keep "beams" (it replaces "channel")' };
  const out: Record<string, unknown> = {};
  for (const [k, spec] of Object.entries(FIELDS)) {
    const v = obj[k];
    if (v === undefined) {
      if (spec.required) return { ok: false, error: `rig lacks required key "${k}"` };
      if (spec.def !== undefined) out[k] = spec.def;
      continue;
    }
    const err = check(k, spec.kind, v);
    if (err) return { ok: false, error: err };
    out[k] = v;
  }
  if (Array.isArray(out.beams)) out.channel = (out.beams as Beam[])[0]!.channel;
  const rig = out as unknown as Rig;
  if (rig.bob_diameter_m !== undefined && rig.bob_diameter_m / 2 >= rig.length_m)
    return { ok: false, error: 'bob_diameter_m/2 must be smaller than length_m' };
  return { ok: true, rig };
}

/** Compact JSON of a rig for the journal's `#rig` line (keys in a fixed order). */
export function rigJson(rig: Rig): string {
  const o: Record<string, unknown> = {};
  for (const k of Object.keys(FIELDS)) {
    const v = (rig as unknown as Record<string, unknown>)[k];
    // `beams` replaces `channel`: writing both would make the line unreadable.
    if (v !== undefined && !(k === 'channel' && rig.beams)) o[k] = v;
  }
  return JSON.stringify(o);
}
