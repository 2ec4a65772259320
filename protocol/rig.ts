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
  readonly channel: number;
  readonly bob_mass_kg?: number;
  readonly string_mass_kg?: number;
  readonly bob_density_kg_m3?: number;
  readonly air_density_kg_m3: number;
  readonly latitude_deg?: number;
  readonly elevation_m?: number;
  readonly name?: string;
}

export type RigResult = { readonly ok: true; readonly rig: Rig } | { readonly ok: false; readonly error: string };

type Kind = 'pos' | 'nonneg' | 'lat' | 'elev' | 'level' | 'channel' | 'text';
const FIELDS: Readonly<Record<keyof Rig, { kind: Kind; required?: true; def?: number | string }>> = {
  length_m: { kind: 'pos', required: true },
  length_u_m: { kind: 'nonneg', def: 0.001 },
  flag_width_m: { kind: 'pos', required: true },
  flag_width_u_m: { kind: 'nonneg', def: 0.0002 },
  bob_diameter_m: { kind: 'pos' },
  blocked_level: { kind: 'level', def: 'low' },
  channel: { kind: 'channel', def: 0 },
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
  }
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
    if (v !== undefined) o[k] = v;
  }
  return JSON.stringify(o);
}
