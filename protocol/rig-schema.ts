// The rig file's schema (zod): every key with its type, plausible range and meaning. protocol/rig.ts turns
// its issues into one-line messages; the same schema is shipped as JSON Schema (protocol/rig.schema.json).
import * as z from 'zod';

/** A likely unit mistake: when `when(v)` holds and v·factor lands in range, the message suggests v·factor. */
export interface UnitHint {
  readonly unit: string;
  readonly factor: number;
  readonly when: (v: number) => boolean;
  /** Added to v·factor (kelvin → °C). */
  readonly offset?: number;
}

/** A number key's plausible range (inclusive unless `aboveMin`), its unit and the unit mistakes it names. */
export interface Measure {
  readonly min: number;
  readonly max: number;
  readonly aboveMin?: true;
  readonly unit: string;
  readonly hints?: readonly UnitHint[];
  readonly description: string;
}

const mm: UnitHint = { unit: 'millimetres', factor: 1e-3, when: () => true };
const mmAbove = (v0: number): UnitHint => ({ unit: 'millimetres', factor: 1e-3, when: (v) => v >= v0 });
const cmBelow = (v1: number): UnitHint => ({ unit: 'centimetres', factor: 1e-2, when: (v) => v < v1 });
const grams: UnitHint = { unit: 'grams', factor: 1e-3, when: () => true };

// Ranges are plausibility limits for a bench pendulum (common practice, no source): wide enough for any
// real rig, narrow enough that a value in the wrong unit falls outside them.
export const MEASURES = {
  length_m: { min: 0.05, max: 30, unit: 'm', hints: [mmAbove(300), cmBelow(300)], description: 'Pivot to the centre of the bob, in metres (0.05 to 30).' },
  length_u_m: { min: 0, max: 1, unit: 'm', hints: [mm], description: 'Standard uncertainty of length_m, in metres. If absent, 1 mm is assumed and said so.' },
  flag_width_m: { min: 1e-4, max: 0.3, unit: 'm', hints: [mmAbove(5), cmBelow(5)], description: 'Width of the flag that blocks the beam (a ball through its centre: its diameter), in metres.' },
  flag_width_u_m: { min: 0, max: 0.1, unit: 'm', hints: [mm], description: 'Standard uncertainty of flag_width_m, in metres. If absent, 0.2 mm is assumed and said so.' },
  bob_diameter_m: { min: 1e-3, max: 0.5, unit: 'm', hints: [mmAbove(5), cmBelow(5)], description: "The bob's diameter (a sphere), in metres: finite-bob correction." },
  bob_mass_kg: { min: 1e-3, max: 50, unit: 'kg', hints: [grams], description: "The bob's mass, in kilograms: string-mass correction." },
  string_mass_kg: { min: 0, max: 1, unit: 'kg', hints: [grams], description: "The string's mass, in kilograms (needs bob_mass_kg)." },
  bob_density_kg_m3: { min: 500, max: 25_000, unit: 'kg/m³', hints: [{ unit: 'g/cm³', factor: 1000, when: (v) => v < 500 }], description: "The bob's density, in kg/m³: buoyancy and added mass." },
  air_density_kg_m3: { min: 0, max: 2, unit: 'kg/m³', description: 'Air density, in kg/m³ (default 1.2).' },
  latitude_deg: { min: -90, max: 90, unit: '°', description: 'Latitude in degrees, north positive: normal gravity for comparison.' },
  elevation_m: { min: -500, max: 9000, unit: 'm', description: 'Elevation above sea level, in metres.' },
  length_step_u_m: { min: 0, max: 0.01, unit: 'm', hints: [mm], description: 'Two-length method: standard uncertainty of a difference between two readings of the length scale, in metres.' },
  length_temp_C: { min: -30, max: 60, unit: '°C', hints: [{ unit: 'kelvin', factor: 1, offset: -273.15, when: (v) => v > 200 }], description: 'Temperature at which the length was measured, in °C, on the same thermometer as the board sensor (default: the run mean).' },
  edge_distance_m: { min: 0.05, max: 10, unit: 'm', hints: [mmAbove(50), cmBelow(50)], description: 'Reversible pendulum: distance between the knife edges, in metres.' },
  edge_distance_u_m: { min: 0, max: 0.1, unit: 'm', hints: [mm], description: 'Standard uncertainty of edge_distance_m, in metres.' },
  cm_distance_m: { min: 0, max: 10, aboveMin: true, unit: 'm', hints: [mmAbove(50), cmBelow(50)], description: "Reversible pendulum: this journal's pivot to the centre of mass, in metres." },
  cm_distance_u_m: { min: 0, max: 0.1, unit: 'm', hints: [mm], description: 'Standard uncertainty of cm_distance_m, in metres (u(h1 − h2) is twice it).' },
  flag_radius_m: { min: 0.02, max: 30, unit: 'm', hints: [mmAbove(50), cmBelow(50)], description: 'Reversible pendulum: pivot to where the beam crosses the flag, in metres.' },
  flag_radius_u_m: { min: 0, max: 0.1, unit: 'm', hints: [mm], description: 'Standard uncertainty of flag_radius_m, in metres: the amplitude reads the ratio of flag width to radius, so it adds to the flag-width term (absent: 0).' },
  mass_position_m: { min: -10, max: 10, unit: 'm', hints: [mm], description: 'Tuning series: position of the movable mass from a fixed mark on the bar, in metres.' },
  body_volume_m3: { min: 0, max: 0.1, aboveMin: true, unit: 'm³', hints: [{ unit: 'cm³', factor: 1e-6, when: () => true }], description: "Rigid pendulum: the body's volume, in m³, for the air correction (with body_mass_kg)." },
  body_mass_kg: { min: 1e-3, max: 200, unit: 'kg', hints: [grams], description: "Rigid pendulum: the body's mass, in kilograms, for the air correction (with body_volume_m3)." },
  angle_deg: { min: -360, max: 360, unit: '°', description: "Horizontal direction of the beam's normal, degrees counterclockwise from above from the rig's reference direction." },
} as const satisfies Record<string, Measure>;

export type MeasureKey = keyof typeof MEASURES;

function measure(key: MeasureKey): z.ZodNumber {
  const m: Measure = MEASURES[key];
  const n = m.aboveMin ? z.number().gt(m.min) : z.number().min(m.min);
  return n.max(m.max).meta({ description: m.description });
}

const beam = z.strictObject({
  channel: z.literal([0, 1]).meta({ description: 'Board channel of this beam (0: D8, 1: D2).' }),
  angle_deg: measure('angle_deg'),
});

const flagWidth = {
  flag_width_m: measure('flag_width_m'),
  flag_width_u_m: measure('flag_width_u_m').optional(),
};
const gate = {
  blocked_level: z.enum(['low', 'high']).default('low').meta({ description: 'Gate output level while the beam is blocked.' }),
  channel: z.int().min(0).max(7).optional().meta({ description: 'Board channel of the one beam (default 0). Not together with beams.' }),
};
/** Keys every rig may have, whatever the pendulum. */
const place = {
  air_density_kg_m3: measure('air_density_kg_m3').default(1.2),
  latitude_deg: measure('latitude_deg').optional(),
  elevation_m: measure('elevation_m').optional(),
  name: z.string().max(200).optional().meta({ description: 'A name for the rig, shown in reports.' }),
  beams: z.array(beam).min(1).max(2).optional().meta({ description: 'One or two horizontal beams through the rest position; replaces channel.' }),
  length_temp_C: measure('length_temp_C').optional(),
  $schema: z.string().optional().meta({ description: 'Path or URL of this JSON Schema, for editors; ignored by halfswing.' }),
};

// Key order is the order of the journal's #rig line (protocol/rig.ts rigJson).
/** The ordinary (simple) pendulum: a bob on a string. */
export const simpleRigSchema = z.strictObject({
  length_m: measure('length_m'),
  length_u_m: measure('length_u_m').optional(),
  ...flagWidth,
  bob_diameter_m: measure('bob_diameter_m').optional(),
  ...gate,
  bob_mass_kg: measure('bob_mass_kg').optional(),
  string_mass_kg: measure('string_mass_kg').optional(),
  bob_density_kg_m3: measure('bob_density_kg_m3').optional(),
  ...place,
  pendulum: z.literal('simple').optional().meta({ description: 'simple (default): a bob on a string; reversible: a bar with two knife edges.' }),
  length_step_u_m: measure('length_step_u_m').optional(),
});

/** The reversible pendulum: a rigid bar timed about one of its two knife edges. */
export const reversibleRigSchema = z.strictObject({
  pendulum: z.literal('reversible'),
  pivot: z.literal([1, 2]).meta({ description: 'Which knife edge this journal swings about.' }),
  edge_distance_m: measure('edge_distance_m'),
  edge_distance_u_m: measure('edge_distance_u_m'),
  cm_distance_m: measure('cm_distance_m'),
  cm_distance_u_m: measure('cm_distance_u_m'),
  flag_radius_m: measure('flag_radius_m'),
  flag_radius_u_m: measure('flag_radius_u_m').optional(),
  ...flagWidth,
  ...gate,
  mass_position_m: measure('mass_position_m').optional(),
  body_volume_m3: measure('body_volume_m3').optional(),
  body_mass_kg: measure('body_mass_kg').optional(),
  ...place,
});

/** Either kind, for the JSON Schema an editor reads. */
export const rigFileSchema = z.union([simpleRigSchema, reversibleRigSchema]);

export const SIMPLE_KEYS = Object.keys(simpleRigSchema.shape);
export const REVERSIBLE_KEYS = Object.keys(reversibleRigSchema.shape);

/** The JSON Schema of a rig file (draft 2020-12), as shipped in protocol/rig.schema.json. */
export function rigJsonSchema(): Record<string, unknown> {
  return {
    ...z.toJSONSchema(rigFileSchema, { io: 'input' }),
    title: 'halfswing rig description',
    description: 'The physical facts about a pendulum and its photogate that the analysis needs. SI units.',
  };
}

/** The text of protocol/rig.schema.json (written by `npm run rig:schema`, checked in sync by a test). */
export function rigSchemaFileText(): string {
  return `${JSON.stringify(rigJsonSchema(), null, 2)}\n`;
}
