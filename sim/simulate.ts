// A whole simulated run: physics → gate → device → link, streamed as journal entries or text lines, with its truth.
import { journalAnnotation, journalData, journalHeader } from '../protocol/journal.ts';
import { rigJson } from '../protocol/rig.ts';
import { DeviceModel } from './device.ts';
import { drawFaultSchedule, type FaultSchedule } from './fault-schedule.ts';
import { linkEntries, type LinkOptions, type SimEntry } from './link.ts';
import { initialLevel, pinEdges, type OpticsSetup, type PinEdge } from './optics.ts';
import { swingSetup, truePhysics } from './physics.ts';
import { omega0SquaredAt } from './room.ts';
import { beamsBlockedAtStart, emptyPlaneTruth, otherBeamLevels, planeEdges, sphericalSetup } from './plane-run.ts';
import { drawMeasuredRig, drawsBetween, type MeasuredRig } from './measured-rig.ts';
import { Rng } from './prng.ts';
import { applyOverrides, ScenarioError, type Scenario, type ScenarioOverrides } from './scenario.ts';
import { bobEvents, inZone, type BobEvent } from './swing.ts';
import { emptyCounts, type Truth } from './truth.ts';

export interface SimOptions extends ScenarioOverrides {
  /** Same seed, same bytes. */
  readonly seed: number;
  /** Run length in seconds (default: the scenario's). */
  readonly durationS?: number;
}

/** Most entries kept per truth series; longer runs keep every stride-th. */
const TRUTH_SERIES_MAX = 100_000;

/** The parts of a run shared by every outlet (and by the emulated firmware, which replaces the device model). */
export interface Run {
  readonly scenario: Scenario;
  readonly truth: Truth;
  readonly header: string[];
  readonly schedule: FaultSchedule;
  readonly rng: Rng;
  /** Pin edges on the host clock, after sensor delays, bounce and objects. */
  readonly edges: () => Generator<PinEdge>;
  readonly initialLevel: 0 | 1;
  readonly otherLevels: { ch: number; level: 0 | 1 }[];
}

export function prepareRun(base: Scenario, opts: SimOptions): Run {
  const scenario = applyOverrides(base, { ...opts, duration_s: opts.durationS ?? opts.duration_s });
  const tEnd = scenario.duration_s;
  const phys = truePhysics(scenario);
  const room = scenario.room;
  const w2AtHost = room ? omega0SquaredAt(scenario, room) : undefined;
  const setup = { ...swingSetup(phys), ...(w2AtHost ? { w2At: (t: number) => w2AtHost(t + scenario.physics.release_at_s) } : {}) };
  const sph = scenario.plane ? sphericalSetup(scenario, phys) : undefined;
  const rng = new Rng(opts.seed);
  const schedule = drawFaultSchedule(scenario.faults, opts.seed, tEnd);
  const counts = emptyCounts();
  counts.device_drop_windows = schedule.drops.length;
  const t0 = scenario.physics.release_at_s;
  const stride = Math.max(1, Math.ceil(tEnd / (phys.T0_s / 2) / TRUTH_SERIES_MAX));
  const truth: Truth = {
    scenario: scenario.name,
    seed: opts.seed,
    start: scenario.host.start,
    duration_s: tEnd,
    physics: phys,
    gate: {
      ...scenario.gate,
      offset_convention: 'metres along the bob path, + toward the release side (release_deg > 0 side)',
      flag_width_m: scenario.rig.flag_width_m,
      blocked_level: scenario.rig.blocked_level,
      channel: scenario.rig.beams[0].channel,
    },
    clock: {
      hz: scenario.device.hz,
      ppm: scenario.device.ppm,
      drift_ppm_per_h: scenario.device.drift_ppm_per_h,
      capture_latency_ticks: scenario.device.capture_latency_ticks,
      model:
        'ticks = floor(hz·((t−b)(1 + ppm·1e-6) + drift·1e-6·(t² − b²)/7200) + phase) + capture_latency_ticks; t, b = host s since #start, b = boot host_s; with a room, + hz·∫_b^t clock_tempco·1e-6·(T − temp_mean_C)',
      boots: [],
    },
    swings: { stride, t_s: [], theta_rad: [] },
    passes: { stride, enter_s: [], exit_s: [], amplitude_rad: [] },
    release_host_s: t0,
    ...(sph ? { plane: emptyPlaneTruth(scenario, stride, sph.ode.W) } : {}),
    final: { t_s: 0, amplitude_rad: phys.release_rad, at_rest: false },
    faults: { schedule, counts },
    complete: false,
  };
  let turns = 0;
  let enters = 0;
  let exitWanted = false;
  const onBob = (e: BobEvent): void => {
    if (e.kind === 'turn') {
      if (turns++ % stride === 0) {
        truth.swings.t_s.push(e.t);
        truth.swings.theta_rad.push(e.theta);
      }
      truth.final = { t_s: e.t, amplitude_rad: e.theta, at_rest: false };
    } else if (e.kind === 'rest') truth.final = { t_s: e.t, amplitude_rad: e.theta, at_rest: true };
    else if (e.kind === 'enter') {
      exitWanted = enters++ % stride === 0;
      if (exitWanted) {
        truth.passes.enter_s.push(e.t);
        truth.passes.amplitude_rad.push(truth.final.amplitude_rad);
      }
    } else if (exitWanted) {
      truth.passes.exit_s.push(e.t);
      exitWanted = false;
    }
  };
  const optics: OpticsSetup = {
    gate: scenario.gate,
    blockedLevel: scenario.rig.blocked_level === 'low' ? 0 : 1,
    bounce: scenario.faults.bounce,
    objects: schedule.objects,
    bobStartsBlocked: sph ? beamsBlockedAtStart(sph)[0]! : inZone(setup, setup.theta0),
    t0,
  };
  const tBob = Math.max(0, tEnd - t0);
  const measured = rigAsMeasured(scenario, opts.seed);
  if (measured) truth.measured_rig = { draws: measured.draws };
  const header = journalHeader({
    start: new Date(scenario.host.start),
    rigJson: rigJson(measured?.rig ?? scenario.rigid ?? scenario.rig),
    source: `halfswing sim scenario=${scenario.name} seed=${opts.seed} (simulated rig, not a measurement)`,
    withMagic: true,
  });
  return {
    scenario,
    truth,
    header,
    schedule,
    rng,
    edges: () =>
      sph
        ? planeEdges(scenario, sph, optics, rng, counts, truth.plane!, onBob, tBob)
        : pinEdges(optics, bobEvents(setup, tBob), rng.fork('optics'), counts, onBob),
    initialLevel: initialLevel(optics),
    otherLevels: sph ? otherBeamLevels(scenario, sph, optics) : [],
  };
}

/** The rig the journal states when the scenario asks for it as measured: drawn from the seed, or the scenario's own. */
function rigAsMeasured(scenario: Scenario, seed: number): MeasuredRig | undefined {
  const truth = scenario.rigid ?? scenario.rig;
  const m = scenario.measured_rig;
  if (m === undefined) return undefined;
  if (m !== true) return { rig: m, draws: drawsBetween(truth, m) };
  // One substream per key: a key added later does not move the draws of the others.
  const rng = new Rng(seed).fork('measured-rig');
  try {
    return drawMeasuredRig(truth, (key) => rng.fork(key).normal());
  } catch (e) {
    throw new ScenarioError(`scenario.measured_rig: seed ${seed}: ${(e as Error).message}`);
  }
}

/** The link from the device to the journal: serial timing, USB, the scenario's wire faults and unplugs. */
export function linkOptions(run: Run): LinkOptions {
  const { scenario, truth } = run;
  return {
    baud: scenario.device.baud,
    host: scenario.host,
    faults: scenario.faults,
    disconnects: run.schedule.disconnects,
    rng: run.rng.fork('link'),
    counts: truth.faults.counts,
    tEnd: scenario.duration_s,
    portName: 'sim0',
  };
}

/** The device model of a run, for outlets that drive it themselves (the pty). */
export function simulateDevice(base: Scenario, opts: SimOptions): { device: DeviceModel; truth: Truth; scenario: Scenario } {
  const run = prepareRun(base, opts);
  return { device: simulateDeviceFrom(run).device, truth: run.truth, scenario: run.scenario };
}

/**
 * The run as journal entries in host-time order, after the header lines. One pass only: `truth`'s counts
 * and series are complete (truth.complete) once `entries` has been iterated to its end.
 */
export function simulateEntries(base: Scenario, opts: SimOptions): { header: string[]; entries: Iterable<SimEntry>; truth: Truth } {
  const run = prepareRun(base, opts);
  const { scenario, truth } = run;
  function* gen(): Generator<SimEntry> {
    const { device } = simulateDeviceFrom(run);
    yield* linkEntries(() => device.pop(), linkOptions(run));
    truth.complete = true;
  }
  return { header: run.header, entries: gen(), truth };
}

function simulateDeviceFrom(run: Run): { device: DeviceModel } {
  return {
    device: new DeviceModel(
      {
        device: run.scenario.device,
        channel: run.scenario.rig.beams[0].channel,
        initialLevel: run.initialLevel,
        otherLevels: run.otherLevels,
        schedule: run.schedule,
        rng: run.rng.fork('device'),
        counts: run.truth.faults.counts,
        boots: run.truth.clock.boots,
        ...(run.scenario.room ? { room: run.scenario.room } : {}),
        tEnd: run.scenario.duration_s,
      },
      run.edges(),
    ),
  };
}

/** The run as complete journal text lines (no LF), header first. One pass; see simulateEntries. */
export function simulateJournal(base: Scenario, opts: SimOptions): { lines: Iterable<string>; truth: Truth } {
  const { header, entries, truth } = simulateEntries(base, opts);
  function* gen(): Generator<string> {
    yield* header;
    for (const e of entries) yield e.kind === 'data' ? journalData(e.hostUs, e.line) : journalAnnotation(e.hostUs, e.word, e.text);
  }
  return { lines: gen(), truth };
}

/** Pin edges of a run on the host clock (for the firmware schedule), with the truth of its physics. */
export function simulatePinEdges(base: Scenario, opts: SimOptions): { edges: Iterable<PinEdge>; initialLevel: 0 | 1; truth: Truth; scenario: Scenario } {
  const run = prepareRun(base, opts);
  return { edges: run.edges(), initialLevel: run.initialLevel, truth: run.truth, scenario: run.scenario };
}
