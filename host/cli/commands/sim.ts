// `halfswing sim`: run a simulated rig to a journal file (with its truth), a pseudo-terminal, or stdout.
import { once } from 'node:events';
import { resolve } from 'node:path';
import { optNumber, optString, type Command, type CommandIo, type ParsedArgs } from '../command.ts';
import { UserError } from '../../errors.ts';
import { guardOutputs, writeWhole, type InputRef } from '../../files/safe-output.ts';
import { duration } from '../../report/format.ts';
import {
  applyOverrides,
  DEFAULT_SCENARIO,
  listScenarios,
  loadScenario,
  ScenarioError,
  simulateJournal,
  truthJson,
  type Scenario,
  type SimOptions,
  type Truth,
} from '../../../sim/index.ts';
import { paceLines } from '../../../sim/pace.ts';
import { SessionOutputError, truthPathFor, writeScenarioJournal, writeSessionJournals } from '../../../sim/outlets/journal-file.ts';
import { listSessions, loadSession } from '../../../sim/outlets/scenario-files.ts';
import type { SessionSpec } from '../../../sim/session.ts';
import { existsSync } from 'node:fs';

/** Parses 90, 90s, 20m, 2h, 7d into seconds. */
export function parseDuration(s: string): number {
  const m = /^([0-9]+(?:\.[0-9]+)?)\s*(s|m|h|d)?$/.exec(s.trim());
  const v = m ? Number(m[1]) * { s: 1, m: 60, h: 3600, d: 86400 }[(m[2] ?? 's') as 's'] : NaN;
  if (/^\s*-/.test(s)) throw new UserError(`--duration must be a positive time like 90s, 20m, 2h or 7d, not '${s}'`, 2);
  if (!(v > 0)) throw new UserError(`--duration must be a time like 90s, 20m, 2h or 7d, not '${s}'`, 2);
  return v;
}

function loadOrFail(name: string, cwd: string): Scenario {
  try {
    return loadScenario(name, cwd);
  } catch (e) {
    if (e instanceof ScenarioError) throw new UserError(`${e.message} (run 'halfswing sim --list')`);
    throw e;
  }
}

function loadSessionOrFail(name: string, cwd: string): SessionSpec {
  try {
    return loadSession(name, cwd);
  } catch (e) {
    if (e instanceof ScenarioError) throw new UserError(`${e.message} (run 'halfswing sim --list')`);
    throw e;
  }
}

/** Writes every run of a session into --out DIR, one status line per run on stderr. */
async function runSession(spec: SessionSpec, args: ParsedArgs, io: CommandIo): Promise<number> {
  const dir = optString(args, 'out');
  if (dir === undefined) throw new UserError('sim: --session needs --out DIR (the folder for its journals)', 2);
  if (!existsSync(resolve(io.cwd, dir))) throw new UserError(`sim: no folder ${dir}: create it first`, 2);
  const dur = optString(args, 'duration');
  const seed = optNumber(args, 'seed', { integer: true, min: 0, max: 1e9 }) ?? 1;
  try {
    const r = await writeSessionJournals(spec, {
      seed,
      dir: resolve(io.cwd, dir),
      durationS: dur !== undefined ? parseDuration(dur) : undefined,
      measured_rig: args.values['measured-rig'] === true,
      onRun: (p, i, n) => io.stderr.write(`halfswing sim: session ${spec.name} run ${i + 1}/${n} → ${p}\n`),
    });
    io.stderr.write(`halfswing sim: wrote ${r.paths.length} journals and ${r.truthPath}\n`);
  } catch (e) {
    if (e instanceof SessionOutputError) throw new UserError(`sim: ${e.message}`);
    throw e;
  }
  return 0;
}

function simOptions(args: ParsedArgs): SimOptions {
  const deg = optNumber(args, 'release', { min: -179, max: 179 });
  const offsetMm = optNumber(args, 'offset-mm');
  const dur = optString(args, 'duration');
  const o: SimOptions = {
    seed: optNumber(args, 'seed', { integer: true, min: 0, max: Number.MAX_SAFE_INTEGER }) ?? 1,
    durationS: dur !== undefined ? parseDuration(dur) : undefined,
    length_m: optNumber(args, 'length', { min: 0.01, max: 100 }),
    g_m_s2: optNumber(args, 'g', { min: 0.1, max: 100 }),
    release_deg: deg,
    linear_q: optNumber(args, 'q', { min: 0.5 }),
    quadratic_per_rad: optNumber(args, 'quadratic', { min: 0 }),
    coulomb_rad: optNumber(args, 'coulomb', { min: 0 }),
    ppm: optNumber(args, 'ppm', { min: -1e5, max: 1e5 }),
    drift_ppm_per_h: optNumber(args, 'drift', { min: -1e4, max: 1e4 }),
    gate_offset_m: offsetMm !== undefined ? offsetMm / 1000 : undefined,
    start: optString(args, 'start'),
    no_faults: args.values['no-faults'] === true,
    measured_rig: args.values['measured-rig'] === true,
  };
  return o;
}

/** Writes with back-pressure; false once the reader has gone (EPIPE after `| head`), which ends the run quietly. */
async function write(out: NodeJS.WritableStream, text: string): Promise<boolean> {
  try {
    if (out.write(text)) return true;
    await once(out, 'drain');
    return true;
  } catch {
    return false;
  }
}

type Source = (scenario: Scenario, opts: SimOptions) => { lines: Iterable<string> | AsyncIterable<string>; truth: Truth };

async function toStdout(source: Source, scenario: Scenario, o: SimOptions, speed: number, truthFile: string | undefined, io: CommandIo): Promise<number> {
  const { lines, truth } = source(scenario, o);
  let closed = false;
  io.stdout.on('error', () => (closed = true));
  const ac = new AbortController();
  const onInt = (): void => ac.abort();
  process.once('SIGINT', onInt);
  try {
    const paced = Number.isFinite(speed) ? paceLines(lines, { speed, signal: ac.signal }) : lines;
    let chunk = '';
    for await (const line of paced as AsyncIterable<string>) {
      chunk += `${line}\n`;
      if (chunk.length >= 1 << 15 || Number.isFinite(speed)) {
        if (!(await write(io.stdout, chunk)) || closed) return 0;
        chunk = '';
      }
    }
    if (chunk) await write(io.stdout, chunk);
  } finally {
    process.removeListener('SIGINT', onInt);
  }
  if (truthFile && truth.complete) await writeWhole([{ path: truthFile, chunks: [`${truthJson(truth)}\n`] }]);
  return 0;
}

/** A status line on stderr while a long emulated run goes (a terminal only), cleared at the end. */
function statusLine(io: CommandIo): { onProgress: (t: number, tEnd: number) => void; done: () => void } {
  const start = Date.now();
  let shown = 0;
  let wrote = false;
  const fmt = (s: number): string => (s >= 3600 ? `${(s / 3600).toFixed(2)} h` : s >= 60 ? `${(s / 60).toFixed(1)} min` : `${s.toFixed(0)} s`);
  return {
    onProgress: (t, tEnd) => {
      const now = Date.now();
      if (!io.stderr.isTTY || now - shown < 500) return;
      shown = now;
      wrote = true;
      const rate = t / Math.max((now - start) / 1000, 1e-3);
      io.stderr.write(`\rhalfswing sim: firmware at ${fmt(t)} of ${fmt(tEnd)} (${rate.toFixed(0)}× real time)  `);
    },
    done: () => {
      if (wrote) io.stderr.write('\r\x1b[K');
    },
  };
}

/** The scenario through the shipped firmware in simavr instead of the device model. */
async function firmwareSource(io: CommandIo): Promise<{ source: Source; done: () => void }> {
  const { firmwareJournal } = await import('../../../sim/emulator/firmware-journal.ts');
  const status = statusLine(io);
  return { source: (sc, o) => firmwareJournal(sc, { ...o, onProgress: status.onProgress }), done: status.done };
}

/** EmulatorUnavailable (toolchain missing, build failed) as one line saying what to do. */
async function emulatorErrors<T>(work: () => Promise<T>): Promise<T> {
  const { EmulatorUnavailable } = await import('../../../sim/emulator/firmware-device.ts');
  try {
    return await work();
  } catch (e) {
    if (e instanceof EmulatorUnavailable) throw new UserError(`sim --firmware: ${e.message}`);
    throw e;
  }
}

export const command: Command = {
  name: 'sim',
  summary: 'simulate a pendulum rig and its device, to a journal, a pty or stdout',
  usage: 'sim [--scenario NAME|FILE] [--journal FILE | --pty] [options]',
  options: {
    scenario: { type: 'string', short: 's', arg: 'NAME|FILE', description: 'scenario name (see --list) or scenario JSON file', default: DEFAULT_SCENARIO },
    list: { type: 'boolean', description: 'list the bundled scenarios and sessions and exit' },
    session: { type: 'string', arg: 'NAME|FILE', description: 'a session of several runs (two lengths, a reversible bar, a tuning series): one journal per run in --out DIR' },
    out: { type: 'string', arg: 'DIR', description: 'with --session: the folder for the journals, their truth files and the session truth' },
    journal: { type: 'string', short: 'o', arg: 'FILE', description: 'write the journal to FILE, and its truth to FILE.truth.json' },
    truth: { type: 'string', arg: 'FILE', description: 'when streaming to stdout: write the truth JSON to FILE at the end' },
    pty: { type: 'boolean', description: 'serve the device on a pseudo-terminal (prints the port to open; needs socat)' },
    firmware: { type: 'boolean', description: 'run the shipped firmware in the simavr emulator as the device (needs avr-gcc, simavr; see README)' },
    speed: { type: 'string', arg: 'N', description: 'N× real time (default: as fast as possible for files and stdout, 1 for --pty); with --journal the file grows in place, for watch' },
    seed: { type: 'string', arg: 'N', description: 'random seed; the same seed gives the same bytes', default: '1' },
    duration: { type: 'string', arg: 'TIME', description: 'rig time to simulate: 90s, 20m, 2h, 7d (default: the scenario\'s)' },
    length: { type: 'string', arg: 'M', description: 'pendulum length, pivot to bob centre (m)' },
    g: { type: 'string', arg: 'M/S2', description: 'true local g (m/s²)' },
    release: { type: 'string', arg: 'DEG', description: 'release angle (degrees)' },
    q: { type: 'string', arg: 'Q', description: 'linear (viscous) damping as small-amplitude Q' },
    quadratic: { type: 'string', arg: 'C', description: 'quadratic (air) damping c in −c|θ\'|θ\' (1/rad)' },
    coulomb: { type: 'string', arg: 'RAD', description: 'pivot friction θ_f (rad; amplitude falls 4θ_f per cycle)' },
    ppm: { type: 'string', arg: 'PPM', description: 'device clock frequency error (ppm, + runs fast)' },
    drift: { type: 'string', arg: 'PPM/H', description: 'device clock drift (ppm per hour)' },
    'offset-mm': { type: 'string', arg: 'MM', description: 'beam offset from the lowest point (mm, + toward the release side)' },
    start: { type: 'string', arg: 'ISO', description: 'the journal\'s #start time (ISO-8601 UTC)' },
    'no-faults': { type: 'boolean', description: 'drop every fault of the scenario' },
    'measured-rig': {
      type: 'boolean',
      description: 'the journal states the rig as measured: each value with a stated u drawn about the truth from --seed (the truth file keeps both); a session measures what its runs share once',
    },
    force: { type: 'boolean', description: 'with --journal: replace an existing file (never a recorded journal)' },
  },
  details: `
Scenarios are JSON files (rig, physics, gate, device, host, faults); see sim/scenario.ts and the bundled sim/scenarios/.
With neither --journal nor --pty the journal streams to stdout, e.g.  halfswing sim --duration 10m | halfswing analyze -
With --firmware the scenario's edges (with its bounce and objects) drive the real firmware in simavr and
its own serial lines are the journal; lost and corrupted lines and unplugs still come from the scenario.
Without --measured-rig the journal states the true rig (exact lengths and widths), so no figure's
uncertainty budget is tested on its rig terms; with it, coverage over seeds tests them (sim/measured-rig.ts).
Everything is simulated: no hardware is touched.`,
  async run(args, io) {
    if (args.values.list) {
      for (const name of listScenarios()) {
        const s = loadOrFail(name, io.cwd);
        io.stdout.write(`${name.padEnd(22)}${s.description}\n`);
      }
      for (const name of listSessions()) io.stdout.write(`${name.padEnd(22)}session: ${loadSessionOrFail(name, io.cwd).description}\n`);
      return 0;
    }
    const session = optString(args, 'session');
    if (session !== undefined) return runSession(loadSessionOrFail(session, io.cwd), args, io);
    const scenario = loadOrFail(optString(args, 'scenario') ?? DEFAULT_SCENARIO, io.cwd);
    const o = simOptions(args);
    const speedS = optNumber(args, 'speed', { min: 1e-3, max: 1e6 });
    const journal = optString(args, 'journal');
    if (journal && args.values.pty) throw new UserError('sim: choose --journal FILE or --pty, not both', 2);
    // The overrides are validated before anything is opened; the run itself applies them again.
    try {
      applyOverrides(scenario, { ...o, duration_s: o.durationS });
    } catch (e) {
      if (e instanceof ScenarioError) throw new UserError(`sim: ${e.message}`, 2);
      throw e;
    }
    const sc = scenario;
    const scenarioArg = optString(args, 'scenario');
    const inputs: InputRef[] = scenarioArg !== undefined ? [{ path: resolve(io.cwd, scenarioArg) }] : [];
    const truthFile = optString(args, 'truth');
    if (journal) await guardJournal(resolve(io.cwd, journal), args.values.force === true, inputs);
    else if (truthFile !== undefined) await guardOutputs([{ path: resolve(io.cwd, truthFile), flag: '--truth' }], inputs);
    if (args.values.firmware) return emulatorErrors(() => runSim(sc, o, speedS, journal, args, io, true));
    return runSim(sc, o, speedS, journal, args, io, false);
  },
};

/** `sim --journal FILE`: refuses an existing file (unless --force; never a recorded journal) before anything runs. */
async function guardJournal(path: string, force: boolean, inputs: InputRef[]): Promise<void> {
  const outputs = [
    { path, flag: '--journal', mustBeNew: true },
    { path: truthPathFor(path), flag: '--journal (its truth file)' },
  ];
  await guardOutputs(outputs, inputs, { force });
}

async function runSim(
  sc: Scenario,
  o: SimOptions,
  speedS: number | undefined,
  journal: string | undefined,
  args: ParsedArgs,
  io: CommandIo,
  firmware: boolean,
): Promise<number> {
  const fw = firmware && !args.values.pty ? await firmwareSource(io) : undefined;
  if (journal) {
    const t = Date.now();
    const ac = new AbortController();
    const onInt = (): void => ac.abort();
    process.once('SIGINT', onInt);
    let r;
    try {
      r = await writeScenarioJournal(sc, { ...o, path: resolve(io.cwd, journal), speed: speedS, signal: ac.signal, source: fw?.source });
    } catch (e) {
      if (ac.signal.aborted) throw new UserError(`sim: stopped; nothing written to ${journal}`, 130);
      const code = (e as NodeJS.ErrnoException).code;
      if (code) throw new UserError(`sim: cannot write ${journal} (${code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code})`);
      throw e;
    } finally {
      process.removeListener('SIGINT', onInt);
      fw?.done();
    }
    const { lines, truth, rigTimeS } = r;
    const truthNote = truth.complete ? ` and ${truthPathFor(journal)}` : ' (stopped early: no truth file)';
    const took = ((Date.now() - t) / 1000).toFixed(1);
    io.stderr.write(`halfswing sim: wrote ${journal} (${lines} lines, ${duration(rigTimeS)} of rig time, ${took} s)${truthNote}\n`);
    return 0;
  }
  if (args.values.pty) {
    const { servePty, PtyError } = await import('../../../sim/outlets/pty.ts');
    const serve = firmware ? (await import('../../../sim/emulator/firmware-pty.ts')).serveFirmwarePty : servePty;
    const ac = new AbortController();
    const onInt = (): void => ac.abort();
    process.once('SIGINT', onInt);
    process.once('SIGTERM', onInt);
    try {
      await serve(sc, {
        ...o,
        speed: speedS ?? 1,
        signal: ac.signal,
        onReady: (p) =>
          io.stdout.write(`halfswing sim: ${firmware ? 'emulated firmware' : 'simulated device'} on ${p} (scenario ${sc.name}, ${speedS ?? 1}× real time; Ctrl-C stops)\n`),
      });
    } catch (e) {
      if (e instanceof PtyError) throw new UserError(`sim: ${e.message}`);
      throw e;
    } finally {
      process.removeListener('SIGINT', onInt);
      process.removeListener('SIGTERM', onInt);
    }
    return 0;
  }
  try {
    const truth = optString(args, 'truth');
    return await toStdout(fw?.source ?? simulateJournal, sc, o, speedS ?? Infinity, truth !== undefined ? resolve(io.cwd, truth) : undefined, io);
  } finally {
    fw?.done();
  }
}
