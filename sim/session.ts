// Sessions of several simulated runs with shared unknowns: string lengths read off one scale with a common offset,
// or a reversible bar on both knife edges (one mass position, or a tuning series of several).
import { parseRig, rigJson, type AnyRig } from '../protocol/rig.ts';
import { drawMeasuredRig, type MeasuredDraw } from './measured-rig.ts';
import { Rng } from './prng.ts';
import { truePhysics } from './physics.ts';
import { barCrossing, barPivot, type BarSpec } from './rigid-bar.ts';
import { parseScenario, ScenarioError, type Scenario } from './scenario.ts';

export interface TwoLengthSpec {
  /** The scale's readings, one run each (the rig's length_m). */
  readonly readings_m: readonly number[];
  /** True pivot-to-bob-centre distance minus the reading (clamp bending length, bob centre). */
  readonly offset_m: number;
  /** u of a difference of two readings: each reading errs by N(0, this/√2). */
  readonly length_step_u_m: number;
}

export interface ReversibleSpec {
  readonly bar: BarSpec;
  /** Movable-mass positions (from the bar's top end); each is timed on both edges. */
  readonly positions_m: readonly number[];
  readonly edge_distance_u_m: number;
  readonly cm_distance_u_m: number;
  /** Pivot to where the beam crosses the flag, for pivot 1 and pivot 2, and the u of each (measured apart, from each pivot). */
  readonly flag_radius_m: readonly [number, number];
  readonly flag_radius_u_m?: number;
  /** Report mass_position_m in the rigs (a tuning series). */
  readonly series: boolean;
}

export interface SessionSpec {
  readonly name: string;
  readonly description: string;
  /** The scenario every run starts from (device, gate, faults, physics other than the geometry). */
  readonly scenario: Scenario;
  readonly two_length?: TwoLengthSpec;
  readonly reversible?: ReversibleSpec;
  /** Journals state the rig as measured (sim/measured-rig.ts): what the runs share is measured once. */
  readonly measured_rig?: boolean;
}

/** One run of a session: its scenario (rig as measured, physics as true) and its seed. */
export interface SessionRun {
  readonly name: string;
  readonly scenario: Scenario;
  readonly seed: number;
}

/** What the session's shared unknowns really were. */
export interface SessionTruth {
  readonly session: string;
  readonly seed: number;
  readonly method: 'two-length' | 'reversible';
  readonly g_m_s2: number;
  readonly length_offset_m?: number;
  /** Reversible: true knife-edge distance, and the true crossing of a series. */
  readonly edge_distance_m?: number;
  readonly crossing_position_m?: number;
  readonly runs: {
    readonly name: string;
    readonly true_T0_s: number;
    readonly true_length_m?: number;
    readonly true_cm_distance_m?: number;
    /** With measured_rig: the other rig values its journal states as measured, beside their truth. */
    readonly measured?: MeasuredDraw[];
  }[];
}

const fail = (what: string): never => {
  throw new ScenarioError(`session ${what}`);
};
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/** Validates a parsed session JSON value. Throws ScenarioError with a one-line message. */
export function parseSession(value: unknown, fallbackName = 'session'): SessionSpec {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) return fail('must be a JSON object');
  const o = value as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!['name', 'description', 'scenario', 'two_length', 'reversible', 'measured_rig'].includes(k)) fail(`.${k} is not a known key`);
  if (o.measured_rig !== undefined && typeof o.measured_rig !== 'boolean') fail('.measured_rig must be true or false');
  if ((o.two_length === undefined) === (o.reversible === undefined)) fail('needs exactly one of two_length, reversible');
  const scenario = parseScenario(o.scenario, typeof o.name === 'string' ? o.name : fallbackName);
  const base = { name: scenario.name, description: typeof o.description === 'string' ? o.description : '', scenario, ...(o.measured_rig === true ? { measured_rig: true } : {}) };
  if (o.two_length !== undefined) {
    const t = o.two_length as TwoLengthSpec;
    if (!Array.isArray(t.readings_m) || t.readings_m.length < 2 || !t.readings_m.every((x) => isNum(x) && x > 0)) fail('.two_length.readings_m must list two or more lengths > 0');
    if (!isNum(t.offset_m) || !isNum(t.length_step_u_m) || t.length_step_u_m < 0) fail('.two_length needs offset_m and length_step_u_m ≥ 0');
    if (scenario.rigid) fail('.two_length needs an ordinary pendulum in its scenario');
    return { ...base, two_length: t };
  }
  const r = o.reversible as ReversibleSpec;
  const bar = r.bar;
  if (!bar || !isNum(bar.length_m) || !isNum(bar.mass_kg) || !isNum(bar.movable_kg) || !Array.isArray(bar.edges_m) || !Array.isArray(bar.fixed))
    fail('.reversible.bar needs length_m, mass_kg, edges_m, fixed and movable_kg');
  if (!Array.isArray(r.positions_m) || r.positions_m.length < 1 || !r.positions_m.every(isNum)) fail('.reversible.positions_m must list one or more positions');
  for (const x of r.positions_m) if (!barPivot(bar, x, 1)) fail(`.reversible: with the mass at ${x} m the centre of mass is not between the knife edges`);
  if (!isNum(r.edge_distance_u_m) || !isNum(r.cm_distance_u_m) || !Array.isArray(r.flag_radius_m) || r.flag_radius_m.length !== 2)
    fail('.reversible needs edge_distance_u_m, cm_distance_u_m and flag_radius_m [pivot 1, pivot 2]');
  if (r.flag_radius_u_m !== undefined && !(isNum(r.flag_radius_u_m) && r.flag_radius_u_m >= 0)) fail('.reversible.flag_radius_u_m must be a number ≥ 0');
  if (!scenario.rigid) fail('.reversible needs a scenario whose rig is a reversible pendulum');
  return { ...base, reversible: { ...r, series: r.series ?? r.positions_m.length > 1 } };
}

type Json = Record<string, unknown>;
/** The scenario JSON of a run: the base with rig and physics replaced in part, and its rig as measured when asked. */
function runScenario(base: Scenario, rig: Json, physics: Json, name: string, measure?: Measure): { scenario: Scenario; measured?: MeasuredDraw[] } {
  const baseRig = JSON.parse(rigJson(base.rigid ?? base.rig)) as Json;
  const { rigid: _r, measured_rig: _m, ...rest } = base;
  const runRig = { ...baseRig, ...rig };
  const m = measure ? drawMeasuredRig(rigOf(runRig), measure) : undefined;
  const json = { ...rest, name, rig: runRig, physics: { ...base.physics, ...physics }, ...(m ? { measured_rig: JSON.parse(rigJson(m.rig)) as Json } : {}) };
  return { scenario: parseScenario(JSON.parse(JSON.stringify(json)), name), ...(m ? { measured: m.draws } : {}) };
}

function rigOf(json: Json): AnyRig {
  const r = parseRig(json);
  if (!r.ok) throw new ScenarioError(`session: a run's rig is not valid: ${r.error}`);
  return r.rig;
}

/** A standard normal per measured key (0: the key is the session's own reading, or not measured apart). */
type Measure = (key: string) => number;

/**
 * The measurements a session's runs share, drawn once from the seed: the one flag (or ball) for every run, and a
 * reversible bar's flag radius once per pivot (measured from that edge; the movable mass does not move the flag).
 * Lengths, the knife-edge distance and the centre-of-mass distances are the session's own readings (drawn above).
 */
function sharedMeasures(seed: number): (pivot: 1 | 2 | null) => Measure {
  const rng = new Rng(seed).fork('session/measured-rig');
  const width = rng.normal();
  const radius = [rng.normal(), rng.normal()];
  return (pivot) => (key) => (key === 'flag_width_m' ? width : key === 'flag_radius_m' && pivot !== null ? radius[pivot - 1]! : 0);
}

/** The runs of a session for one seed, with the measurement errors drawn from that seed, and the truth. */
export function sessionRuns(spec: SessionSpec, seed: number, opts: { measured_rig?: boolean } = {}): { runs: SessionRun[]; truth: SessionTruth } {
  const rng = new Rng(seed).fork('session');
  const measure = spec.measured_rig || opts.measured_rig ? sharedMeasures(seed) : undefined;
  const g = spec.scenario.physics.g_m_s2;
  const runs: SessionRun[] = [];
  const truthRuns: SessionTruth['runs'][number][] = [];
  const runSeed = (i: number): number => seed * 1000 + i + 1;
  if (spec.two_length) {
    const t = spec.two_length;
    t.readings_m.forEach((x, i) => {
      const L = x + t.offset_m - (t.length_step_u_m / Math.SQRT2) * rng.normal();
      const name = `${spec.name}-${String(i + 1).padStart(2, '0')}`;
      const { scenario, measured } = runScenario(spec.scenario, { length_m: x, length_step_u_m: t.length_step_u_m }, { length_m: L }, name, measure?.(null));
      runs.push({ name, scenario, seed: runSeed(i) });
      truthRuns.push({ name, true_T0_s: truePhysics(scenario).T0_s, true_length_m: L, ...(measured ? { measured } : {}) });
    });
    return { runs, truth: { session: spec.name, seed, method: 'two-length', g_m_s2: g, length_offset_m: t.offset_m, runs: truthRuns } };
  }
  const r = spec.reversible!;
  const l = r.bar.edges_m[1] - r.bar.edges_m[0];
  const lRead = l + r.edge_distance_u_m * rng.normal();
  r.positions_m.forEach((x, j) => {
    // One balance point per mass position: h1 and h2 err by the same amount in opposite directions.
    const balance = r.cm_distance_u_m * rng.normal();
    for (const pivot of [1, 2] as const) {
      const p = barPivot(r.bar, x, pivot)!;
      const i = 2 * j + pivot - 1;
      const name = `${spec.name}-${String(i + 1).padStart(2, '0')}`;
      const rig: Json = {
        pivot,
        edge_distance_m: lRead,
        edge_distance_u_m: r.edge_distance_u_m,
        cm_distance_m: p.h_m + (pivot === 1 ? balance : -balance),
        cm_distance_u_m: r.cm_distance_u_m,
        flag_radius_m: r.flag_radius_m[pivot - 1],
        ...(r.flag_radius_u_m !== undefined ? { flag_radius_u_m: r.flag_radius_u_m } : {}),
        ...(r.series ? { mass_position_m: x } : {}),
      };
      const { scenario, measured } = runScenario(spec.scenario, rig, { cm_distance_m: p.h_m, gyration_radius_m: p.k_m }, name, measure?.(pivot));
      runs.push({ name, scenario, seed: runSeed(i) });
      truthRuns.push({ name, true_T0_s: truePhysics(scenario).T0_s, true_cm_distance_m: p.h_m, ...(measured ? { measured } : {}) });
    }
  });
  const xs = r.positions_m;
  const span = Math.max(...xs) - Math.min(...xs);
  const crossing = r.series ? barCrossing(r.bar, g, Math.min(...xs) - span, Math.max(...xs) + span) : null;
  return {
    runs,
    truth: { session: spec.name, seed, method: 'reversible', g_m_s2: g, edge_distance_m: l, ...(crossing !== null ? { crossing_position_m: crossing } : {}), runs: truthRuns },
  };
}
