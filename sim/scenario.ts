// Scenario files: a rig, its true physics, gate, device, host link and faults, validated strictly.
import { isSimpleRig, parseRig, rigJson, type AnyRig, type ReversibleRig, type Rig } from '../protocol/rig.ts';
import type { RoomSetup } from './room.ts';
import {
  CH0_MIN_PULSE_TICKS,
  CHANNEL_LATENCY_TICKS,
  DEFAULT_BAUD,
  DEFAULT_TICK_HZ,
  EDGE_RING_CAPACITY,
  HEARTBEAT_DEFAULT_MS,
} from '../protocol/link-defaults.ts';

/** A range [min, max] from which each event draws uniformly. */
export type Range = readonly [number, number];

/** Events at fixed times and/or as a Poisson process. */
export interface EventFault {
  readonly at_s?: readonly number[];
  readonly rate_per_h?: number;
}

export interface Faults {
  /** Extra short pulses right after an optical transition. */
  readonly bounce?: { readonly probability: number; readonly pulses: Range; readonly width_us: Range; readonly gap_us: Range };
  /** Something else crossing the beam (a hand, a moth): a long block. */
  readonly object?: EventFault & { readonly duration_ms: Range };
  /** Whole lines lost on the wire. */
  readonly lost_lines?: { readonly probability: number };
  /** One byte of a line replaced by another printable character. */
  readonly corrupt?: { readonly probability: number };
  /** Device resets: lines in flight are lost, a new H follows, seq and ticks restart. */
  readonly reboot?: EventFault & { readonly cause?: 'watchdog' | 'external' | 'brownout' | 'power' };
  /** The host loses the port for a while; optionally the board resets when it is opened again. */
  readonly disconnect?: EventFault & { readonly duration_s: Range; readonly reset_on_connect?: boolean };
  /** Windows in which the device drops every edge (its buffer is full): `lost` rises. */
  readonly device_drop?: EventFault & { readonly duration_ms: Range };
  /** The device's main loop hangs: no lines, no heartbeats; edges fill its buffer, then are lost. */
  readonly stall?: EventFault & { readonly duration_s: Range };
}

export interface Scenario {
  readonly name: string;
  readonly description: string;
  /** The ordinary rig; for a reversible pendulum its gate-side view (length_m = flag radius) and `rigid` the file's rig. */
  readonly rig: Rig;
  readonly rigid?: ReversibleRig;
  readonly duration_s: number;
  readonly physics: {
    readonly g_m_s2: number;
    readonly release_deg: number;
    /** Host seconds since #start at which the bob is let go (held still before). */
    readonly release_at_s: number;
    /** Linear damping as the small-amplitude Q (null or absent: none). */
    readonly linear_q?: number;
    /** c in θ'' … − c |θ'|θ' (1/rad): ΔA = (8/3)cA² per cycle. */
    readonly quadratic_per_rad?: number;
    /** θ_f of pivot friction (rad): ΔA = 4θ_f per cycle. */
    readonly coulomb_rad?: number;
    /** Added-mass coefficient of the air moved with the bob (used when the rig gives bob_density_kg_m3). */
    readonly added_mass_k: number;
    /** The true pivot-to-bob-centre distance when it differs from the rig's reading (a length scale with an offset). */
    readonly length_m?: number;
    /** A rigid (reversible) pendulum: true pivot to centre of mass, and radius of gyration about the centre of mass. */
    readonly cm_distance_m?: number;
    readonly gyration_radius_m?: number;
  };
  readonly gate: {
    /** Beam's horizontal offset from the lowest point, + toward the release side (m). */
    readonly offset_m: number;
    readonly blocking_delay_us: number;
    readonly unblocking_delay_us: number;
    readonly jitter_us: number;
  };
  readonly device: {
    readonly hz: number;
    readonly ppm: number;
    readonly drift_ppm_per_h: number;
    readonly heartbeat_ms: number;
    readonly fw: string;
    readonly mcu: string;
    readonly channels: number;
    readonly baud: number;
    /** Input synchroniser + noise canceller, in ticks, added to every captured value. */
    readonly capture_latency_ticks: number;
    /** Time from capture to the line entering the UART. */
    readonly emit_latency_us: Range;
    /** Host time of the first boot, and the reset-to-hello time of every boot. */
    readonly first_boot_s: number;
    readonly boot_time_s: number;
    /** Edge buffer depth while the main loop is stalled. */
    readonly buffer_edges: number;
    /**
     * The capture ISR's blind time, measured on the emulated firmware (ch0; test/sim/sim-emulator.test.ts
     * re-measures it): an edge sooner than `min_edge_gap_ticks` (CH0_MIN_PULSE_TICKS, 28) after a capture
     * comes before the edge-select flip and is missed, and so is the edge after it if it comes before the
     * handler re-arms, `pin_check_ticks` (122) after the capture; the one after those is captured. The
     * firmware counts both missed edges in `lost` (the vector samples the pin right after its flip; the
     * handler sees a late capture or the pin at re-arm). Not modelled: a capture that arrives
     * while the handler runs and is followed by two more edges before its own vector (firmware/README.md).
     */
    readonly min_edge_gap_ticks: number;
    readonly pin_check_ticks: number;
  };
  readonly host: {
    readonly start: string;
    readonly usb_frame_us: number;
    readonly usb_tail: { readonly kind: 'exponential' | 'lognormal'; readonly mean_us: number; readonly sigma?: number };
  };
  readonly faults: Faults;
  /**
   * The bob's motion in two horizontal directions (a spherical pendulum, sim/spherical.ts). Present, or a rig
   * with `beams`, switches the run to that model; absent, the bob swings in the plane of a single beam's normal.
   */
  readonly plane?: PlaneSetup;
  /** The room: temperature, pressure and humidity over the run, the length following the temperature, and room readings from the device. */
  readonly room?: RoomSetup;
  /**
   * The journal's rig as a user would measure it (sim/measured-rig.ts), while the physics keeps `rig`: true draws
   * each measured value about the truth with its stated u from the run's seed; a rig is that file as given (a
   * session draws the measurements its runs share once). Absent: the journal states the true rig.
   */
  readonly measured_rig?: true | AnyRig;
}

export interface PlaneSetup {
  /** Direction of the release, ° counterclockwise from above from the rig's reference direction. */
  readonly azimuth_deg: number;
  /** Horizontal speed at release across the release direction, + counterclockwise from above (m/s). */
  readonly transverse_m_s: number;
  /** The support's stiff principal axis, ° counterclockwise from the reference direction. */
  readonly stiff_axis_deg: number;
  /** ω_stiff/ω_soft − 1 of the support's two small-swing frequencies. */
  readonly frequency_split: number;
  /** Turn the room with the Earth at the rig's latitude_deg (ignored without one). */
  readonly earth_rotation: boolean;
}

/** A scenario that cannot be used: the message is one line saying what to fix. */
export class ScenarioError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ScenarioError';
  }
}

const DEFAULTS = {
  physics: { added_mass_k: 0.5, release_at_s: 0.5 },
  gate: { offset_m: 0, blocking_delay_us: 2, unblocking_delay_us: 8, jitter_us: 1 },
  device: {
    hz: DEFAULT_TICK_HZ,
    ppm: 0,
    drift_ppm_per_h: 0,
    heartbeat_ms: HEARTBEAT_DEFAULT_MS,
    fw: '0.1.0',
    mcu: 'sim',
    channels: 2,
    baud: DEFAULT_BAUD,
    // Silicon's ch0 latency, the one the host assumes; emulator comparisons set the emulator's (0).
    capture_latency_ticks: CHANNEL_LATENCY_TICKS[0],
    // Capture (or heartbeat deadline) to the line's first byte in the UART, measured on the emulated firmware
    // with the CPU otherwise idle: 230–340 µs (test/firmware/firmware-model-parity.test.ts checks it).
    emit_latency_us: [230, 340],
    first_boot_s: 0.05,
    boot_time_s: 1.6,
    buffer_edges: EDGE_RING_CAPACITY,
    min_edge_gap_ticks: CH0_MIN_PULSE_TICKS,
    pin_check_ticks: 122,
  },
  host: { start: '2026-01-05T09:00:00.000Z', usb_frame_us: 1000, usb_tail: { kind: 'exponential', mean_us: 150 } },
} as const;

type Check = (v: unknown, at: string) => void;

const fail = (at: string, what: string): never => {
  throw new ScenarioError(`${at} ${what}`);
};
const num =
  (min = -Infinity, max = Infinity, strictMin = false): Check =>
  (v, at) => {
    if (typeof v !== 'number' || !Number.isFinite(v) || v < min || (strictMin && v === min) || v > max)
      fail(at, `must be a number${strictMin ? ` > ${min}` : min > -Infinity ? ` ≥ ${min}` : ''}${max < Infinity ? ` and ≤ ${max}` : ''}`);
  };
const prob: Check = num(0, 1);
const str: Check = (v, at) => {
  if (typeof v !== 'string') fail(at, 'must be a string');
};
const range =
  (min = 0): Check =>
  (v, at) => {
    if (!Array.isArray(v) || v.length !== 2 || v.some((x) => typeof x !== 'number' || !Number.isFinite(x) || x < min) || v[0] > v[1])
      fail(at, `must be [min, max] with ${min} ≤ min ≤ max`);
  };
const times: Check = (v, at) => {
  if (!Array.isArray(v) || v.some((x) => typeof x !== 'number' || !Number.isFinite(x) || x < 0)) fail(at, 'must be a list of times ≥ 0 (s)');
};
const oneOf =
  (...opts: string[]): Check =>
  (v, at) => {
    if (typeof v !== 'string' || !opts.includes(v)) fail(at, `must be one of ${opts.map((o) => `"${o}"`).join(', ')}`);
  };
const bool: Check = (v, at) => {
  if (typeof v !== 'boolean') fail(at, 'must be true or false');
};

function object(v: unknown, at: string, spec: Record<string, Check>, required: readonly string[] = []): void {
  if (typeof v !== 'object' || v === null || Array.isArray(v)) fail(at, 'must be an object');
  const o = v as Record<string, unknown>;
  for (const k of Object.keys(o)) if (!(k in spec)) fail(`${at}.${k}`, `is not a known key (known: ${Object.keys(spec).join(', ')})`);
  for (const k of required) if (o[k] === undefined) fail(`${at}.${k}`, 'is required');
  for (const [k, check] of Object.entries(spec)) if (o[k] !== undefined) check(o[k], `${at}.${k}`);
}
const sub =
  (spec: Record<string, Check>, required: readonly string[] = []): Check =>
  (v, at) =>
    object(v, at, spec, required);

const event = { at_s: times, rate_per_h: num(0) };
const FAULTS: Record<string, Check> = {
  bounce: sub({ probability: prob, pulses: range(0), width_us: range(0), gap_us: range(0) }, ['probability', 'pulses', 'width_us', 'gap_us']),
  object: sub({ ...event, duration_ms: range(0) }, ['duration_ms']),
  lost_lines: sub({ probability: prob }, ['probability']),
  corrupt: sub({ probability: prob }, ['probability']),
  reboot: sub({ ...event, cause: oneOf('watchdog', 'external', 'brownout', 'power') }),
  disconnect: sub({ ...event, duration_s: range(0), reset_on_connect: bool }, ['duration_s']),
  device_drop: sub({ ...event, duration_ms: range(0) }, ['duration_ms']),
  stall: sub({ ...event, duration_s: range(0) }, ['duration_s']),
};

/** Validates a parsed scenario JSON value and fills in defaults. Throws ScenarioError. */
export function parseScenario(value: unknown, fallbackName = 'scenario'): Scenario {
  object(
    value,
    'scenario',
    {
      name: str,
      description: str,
      rig: () => undefined,
      duration_s: num(0, Infinity, true),
      physics: sub(
        {
          g_m_s2: num(0, 100, true),
          release_deg: num(-179, 179),
          release_at_s: num(0),
          linear_q: num(0.5, Infinity),
          quadratic_per_rad: num(0),
          coulomb_rad: num(0),
          added_mass_k: num(0, 5),
          length_m: num(0, 100, true),
          cm_distance_m: num(0, 100, true),
          gyration_radius_m: num(0, 100, true),
        },
        ['g_m_s2', 'release_deg'],
      ),
      gate: sub({ offset_m: num(), blocking_delay_us: num(0), unblocking_delay_us: num(0), jitter_us: num(0) }),
      device: sub({
        hz: num(1000, 1e9),
        ppm: num(-1e5, 1e5),
        drift_ppm_per_h: num(-1e4, 1e4),
        heartbeat_ms: num(100, 60000),
        fw: (v, at) => {
          if (typeof v !== 'string' || !/^\d\.\d\.\d$/.test(v)) fail(at, 'must be x.y.z with one digit each (5 characters)');
        },
        mcu: (v, at) => {
          if (typeof v !== 'string' || !/^[a-z0-9]{1,8}$/.test(v)) fail(at, 'must be 1 to 8 lowercase letters or digits');
        },
        channels: num(1, 8),
        baud: num(1200, 4e6),
        capture_latency_ticks: num(0, 1000),
        emit_latency_us: range(0),
        first_boot_s: num(0),
        boot_time_s: num(0),
        buffer_edges: num(0, 1e6),
        min_edge_gap_ticks: num(0, 1e6),
        pin_check_ticks: num(0, 1e6),
      }),
      host: sub({
        start: (v, at) => {
          if (typeof v !== 'string' || !/^\d{4}-\d{2}-\d{2}T[\d:.]+Z$/.test(v) || Number.isNaN(Date.parse(v))) fail(at, 'must be an ISO-8601 UTC time');
        },
        usb_frame_us: num(0),
        usb_tail: sub({ kind: oneOf('exponential', 'lognormal'), mean_us: num(0), sigma: num(0) }, ['kind', 'mean_us']),
      }),
      faults: sub(FAULTS),
      room: sub(
        {
          temp_mean_C: num(-40, 85),
          temp_amp_K: num(0, 20),
          temp_period_h: num(0.01, 1000, true),
          press_Pa: num(30000, 110000),
          front_Pa: num(-10000, 10000),
          front_at_h: num(),
          front_width_h: num(0.001, 1000, true),
          rh_mean_pct: num(0, 100),
          rh_amp_pct: num(0, 50),
          expansion_per_K: num(-1e-3, 1e-3),
          length_temp_C: num(-40, 85),
          interval_s: num(1, 3600),
          clock_tempco_ppm_per_K: num(-1000, 1000),
        },
        [],
      ),
      plane: sub({ azimuth_deg: num(-360, 360), transverse_m_s: num(-10, 10), stiff_axis_deg: num(-360, 360), frequency_split: num(-0.5, 0.5), earth_rotation: bool }),
      measured_rig: (v, at) => {
        if (typeof v !== 'boolean' && (typeof v !== 'object' || v === null || Array.isArray(v))) fail(at, 'must be true, false or a rig as measured');
      },
    },
    ['rig', 'duration_s', 'physics'],
  );
  const o = value as Record<string, Record<string, unknown>>;
  const anyRig = parseRig(o.rig);
  if (!anyRig.ok) throw new ScenarioError(`scenario.rig: ${anyRig.error}`);
  const rigid = isSimpleRig(anyRig.rig) ? undefined : anyRig.rig;
  // The simulator's gate and device see a reversible pendulum's flag at its radius, as a bob at that length.
  const rig = { rig: isSimpleRig(anyRig.rig) ? anyRig.rig : asFlagRadius(anyRig.rig) };
  if (!Number.isInteger(o.device?.channels ?? 2)) fail('scenario.device.channels', 'must be an integer');
  if (rig.rig.beams[0].channel >= Number(o.device?.channels ?? DEFAULTS.device.channels)) fail('scenario.rig.channel', 'must be below device.channels');
  if (rig.rig.string_mass_kg !== undefined && rig.rig.bob_mass_kg === undefined)
    fail('scenario.rig.string_mass_kg', 'needs bob_mass_kg as well, to model the string');
  const physics = { ...DEFAULTS.physics, ...o.physics } as Scenario['physics'];
  if (rigid && (physics.cm_distance_m === undefined || physics.gyration_radius_m === undefined))
    fail('scenario.physics', 'needs cm_distance_m and gyration_radius_m for a reversible pendulum');
  if (!rigid && (physics.cm_distance_m !== undefined || physics.gyration_radius_m !== undefined))
    fail('scenario.physics.cm_distance_m', 'belongs to a reversible pendulum (rig "pendulum": "reversible")');
  if (Math.abs(physics.release_deg) <= (Math.asin(Math.min(1, (rig.rig.flag_width_m / 2) / rig.rig.length_m)) * 180) / Math.PI)
    fail('scenario.physics.release_deg', 'is too small for the bob to leave the beam');
  // Two beams, or one beam at a slant, ask for the two-direction swing; one beam at angle 0 is the planar swing.
  const beams = rig.rig.beams;
  const plane = o.plane !== undefined || beams.length === 2 || beams[0].angle_deg !== 0 ? { ...PLANE_DEFAULTS, ...o.plane } : undefined;
  if (plane && (physics.quadratic_per_rad || physics.coulomb_rad))
    fail('scenario.physics', 'of a two-direction (spherical) swing takes linear_q only: drop quadratic_per_rad and coulomb_rad');
  const measured = measuredRigOf(o.measured_rig, anyRig.rig);
  return {
    name: typeof o.name === 'string' ? (o.name as unknown as string) : fallbackName,
    description: typeof o.description === 'string' ? (o.description as unknown as string) : '',
    rig: rig.rig,
    ...(rigid ? { rigid } : {}),
    duration_s: o.duration_s as unknown as number,
    physics,
    gate: { ...DEFAULTS.gate, ...o.gate },
    device: { ...DEFAULTS.device, ...o.device } as Scenario['device'],
    host: { ...DEFAULTS.host, ...o.host } as Scenario['host'],
    faults: (o.faults ?? {}) as Faults,
    ...(plane ? { plane } : {}),
    ...(o.room !== undefined ? { room: { ...ROOM_DEFAULTS, ...o.room } as RoomSetup } : {}),
    ...(measured !== undefined ? { measured_rig: measured } : {}),
  };
}

/** The scenario's `measured_rig`: true, a rig of the same kind as the true one, or absent (false). */
function measuredRigOf(v: unknown, truth: AnyRig): true | AnyRig | undefined {
  if (v === undefined || v === false) return undefined;
  if (v === true) return true;
  const r = parseRig(v);
  if (!r.ok) return fail('scenario.measured_rig', `is not a valid rig: ${r.error}`);
  if (isSimpleRig(r.rig) !== isSimpleRig(truth)) fail('scenario.measured_rig', 'must be the same kind of pendulum as scenario.rig');
  return r.rig;
}

/** A room with a ±2 K day, a 9 hPa falling front at mid-run and a brass-ish string (18 ppm/K, from memory: docs/references.md#ref-air-density). */
const ROOM_DEFAULTS: RoomSetup = {
  temp_mean_C: 21,
  temp_amp_K: 2,
  temp_period_h: 24,
  press_Pa: 101325,
  front_Pa: -900,
  front_at_h: 4,
  front_width_h: 1,
  rh_mean_pct: 45,
  rh_amp_pct: 5,
  expansion_per_K: 18e-6,
  length_temp_C: 21,
  interval_s: 10,
  clock_tempco_ppm_per_K: 0,
};

const PLANE_DEFAULTS: PlaneSetup = { azimuth_deg: 0, transverse_m_s: 0, stiff_axis_deg: 0, frequency_split: 0, earth_rotation: true };

/** Command-line style overrides of a scenario's main parameters. */
export interface ScenarioOverrides {
  readonly length_m?: number;
  readonly g_m_s2?: number;
  readonly release_deg?: number;
  readonly linear_q?: number;
  readonly quadratic_per_rad?: number;
  readonly coulomb_rad?: number;
  readonly ppm?: number;
  readonly drift_ppm_per_h?: number;
  readonly gate_offset_m?: number;
  readonly duration_s?: number;
  readonly start?: string;
  /** Drop every fault of the scenario. */
  readonly no_faults?: boolean;
  /** Write the rig as measured into the journal (drawn from the run's seed), unless the scenario gives its own. */
  readonly measured_rig?: boolean;
}

/** A scenario with overrides applied, validated again. */
/** The fields of a reversible rig the gate and device need, in the ordinary rig's shape (length = flag radius). */
function asFlagRadius(r: ReversibleRig): Rig {
  const { pendulum: _p, pivot: _v, edge_distance_m: _e, edge_distance_u_m: _eu, cm_distance_m: _c, cm_distance_u_m: _cu, flag_radius_m, flag_radius_u_m: _fu, mass_position_m: _m, body_volume_m3: _bv, body_mass_kg: _bm, ...common } = r;
  return { ...common, length_m: flag_radius_m, length_u_m: 0 };
}

export function applyOverrides(s: Scenario, o: ScenarioOverrides): Scenario {
  const def = <T>(v: T | undefined, d: T): T => (v === undefined ? d : v);
  const raw = {
    name: s.name,
    description: s.description,
    // The rig as its file gives it: a plain one-beam rig must not come back naming beams.
    rig: s.rigid ? rigidFileRig(s.rigid, o) : { ...(JSON.parse(rigJson(s.rig)) as object), length_m: def(o.length_m, s.rig.length_m) },
    duration_s: def(o.duration_s, s.duration_s),
    physics: {
      ...s.physics,
      g_m_s2: def(o.g_m_s2, s.physics.g_m_s2),
      release_deg: def(o.release_deg, s.physics.release_deg),
      linear_q: def(o.linear_q, s.physics.linear_q),
      quadratic_per_rad: def(o.quadratic_per_rad, s.physics.quadratic_per_rad),
      coulomb_rad: def(o.coulomb_rad, s.physics.coulomb_rad),
    },
    gate: { ...s.gate, offset_m: def(o.gate_offset_m, s.gate.offset_m) },
    device: { ...s.device, ppm: def(o.ppm, s.device.ppm), drift_ppm_per_h: def(o.drift_ppm_per_h, s.device.drift_ppm_per_h) },
    host: { ...s.host, start: def(o.start, s.host.start) },
    faults: o.no_faults ? {} : s.faults,
    ...(s.plane ? { plane: s.plane } : {}),
    ...(s.room ? { room: s.room } : {}),
    ...(measuredRigJson(s, o) !== undefined ? { measured_rig: measuredRigJson(s, o) } : {}),
  };
  return parseScenario(JSON.parse(JSON.stringify(raw)), s.name);
}

/** The scenario's measured rig as JSON for a re-parse: its own, else true when asked for. */
function measuredRigJson(s: Scenario, o: ScenarioOverrides): true | object | undefined {
  if (s.measured_rig !== undefined && s.measured_rig !== true) return JSON.parse(rigJson(s.measured_rig)) as object;
  return s.measured_rig === true || o.measured_rig ? true : undefined;
}

/** A reversible pendulum's rig as its file has it (it has no length to override). */
function rigidFileRig(rig: ReversibleRig, o: ScenarioOverrides): object {
  if (o.length_m !== undefined) throw new ScenarioError('scenario.rig: a reversible pendulum has no length to override');
  return JSON.parse(rigJson(rig)) as object;
}
