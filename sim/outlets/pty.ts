// The simulated device behind a pseudo-terminal (socat pty pair), so the host opens it like a real serial port.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SerialPort } from 'serialport';
import { ReadlineParser } from '@serialport/parser-readline';
import { corruptLine } from '../link.ts';
import { Rng } from '../prng.ts';
import type { Scenario } from '../scenario.ts';
import { simulateDevice, type SimOptions } from '../simulate.ts';
import type { Truth } from '../truth.ts';
import type { DeviceLine, DeviceModel } from '../device.ts';

/** The pty could not be set up (socat missing, links not created). */
export class PtyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PtyError';
  }
}

export interface PtyOptions extends SimOptions {
  readonly speed: number;
  readonly signal?: AbortSignal;
  /** Called once with the path the host should open. */
  readonly onReady: (hostPath: string) => void;
  readonly now?: () => number;
  /** Start the run's clock at the host's first command (a host that opens the port late misses nothing). */
  readonly startOnCommand?: boolean;
  /** Called with every line the device sends, before wire faults (for tests that account for every line). */
  readonly onSent?: (line: string) => void;
  /** Waits about `ms` wall milliseconds (default setTimeout); a command or the signal ends it early. */
  readonly sleep?: (ms: number) => Promise<void>;
}

interface PtyPair {
  readonly hostPath: string;
  readonly simPath: string;
  close(): Promise<void>;
}

/** Starts `socat` with two linked ptys in a fresh temporary folder. */
export async function openPtyPair(): Promise<PtyPair> {
  const dir = await mkdtemp(join(tmpdir(), 'halfswing-pty-'));
  const hostPath = join(dir, 'ttySIM0');
  const simPath = join(dir, 'sim-end');
  let proc: ChildProcess;
  try {
    proc = spawn('socat', [`pty,raw,echo=0,link=${hostPath}`, `pty,raw,echo=0,link=${simPath}`], { stdio: 'ignore' });
  } catch {
    await rm(dir, { recursive: true, force: true });
    throw new PtyError('cannot start socat (install it: apt-get install socat)');
  }
  const failed = new Promise<string>((resolve) => {
    proc.once('error', () => resolve('cannot start socat (install it: apt-get install socat)'));
    proc.once('exit', (code) => resolve(`socat exited early (code ${code})`));
  });
  // If this process exits without closing (a test worker torn down), socat and the folder must not outlive it.
  const onExit = (): void => {
    proc.kill('SIGTERM');
    rmSync(dir, { recursive: true, force: true });
  };
  process.once('exit', onExit);
  const close = async (): Promise<void> => {
    process.removeListener('exit', onExit);
    // A socat that never started (not installed) has no pid and will send no 'exit'.
    if (proc.pid !== undefined && proc.exitCode === null && proc.signalCode === null) {
      proc.kill('SIGTERM');
      await new Promise((r) => proc.once('exit', r));
    }
    await rm(dir, { recursive: true, force: true });
  };
  for (let i = 0; i < 250; i++) {
    if (existsSync(hostPath) && existsSync(simPath)) return { hostPath, simPath, close };
    const why = await Promise.race([failed, new Promise<undefined>((r) => setTimeout(() => r(undefined), 20))]);
    if (why) {
      await close();
      throw new PtyError(why);
    }
  }
  await close();
  throw new PtyError('socat did not create the pty links within 5 s');
}

/** The device behind the pty: the model, or the emulated firmware. */
export interface PtyDevice {
  /** A host command line (without LF) arriving at host time t. */
  command(t: number, text: string): void;
  /** The lines the device has begun sending by host time t, in order. */
  linesUntil(t: number): DeviceLine[] | Promise<DeviceLine[]>;
  /** Host time at which to look again after t; Infinity once the run is over. */
  nextAt(t: number): number;
}

/** The device model as a pty device: it knows when its next line is due. */
function modelDevice(device: DeviceModel): PtyDevice {
  return {
    command: (t, text) => device.command(t, text),
    linesUntil: (t) => {
      const out: DeviceLine[] = [];
      while (device.peekTime() <= t) out.push(device.pop()!);
      return out;
    },
    nextAt: () => device.peekTime(),
  };
}

/**
 * Runs the scenario's device model in real time (× speed) on a pty until the run ends or the signal aborts.
 * Host commands (`?`, `P`, `C`) are answered like the firmware. Wire faults (lost, corrupted lines) apply;
 * USB latency and disconnects do not (the host's own port supplies those).
 */
export async function servePty(scenario: Scenario, opts: PtyOptions): Promise<Truth> {
  const { device, truth, scenario: sc } = simulateDevice(scenario, opts);
  return servePtyDevice(modelDevice(device), sc, truth, opts);
}

/** Serves any pty device paced to the (injected) clock: × opts.speed, commands answered as they come. */
export async function servePtyDevice(device: PtyDevice, sc: Scenario, truth: Truth, opts: PtyOptions): Promise<Truth> {
  const pair = await openPtyPair();
  const port = new SerialPort({ path: pair.simPath, baudRate: 115200 });
  const wireRng = new Rng(opts.seed, 'pty-wire');
  const counts = truth.faults.counts;
  const sleep = opts.sleep ?? ((ms: number) => new Promise<void>((r) => setTimeout(r, ms)));
  try {
    await new Promise<void>((resolve, reject) => port.once('open', resolve).once('error', reject));
    const now = opts.now ?? (() => performance.now());
    let t0 = now();
    const simNow = (): number => Math.max(0, ((now() - t0) / 1000) * opts.speed);
    let wake: () => void = () => undefined;
    const commands: { t: number; text: string }[] = [];
    port.pipe(new ReadlineParser({ delimiter: '\n', encoding: 'latin1' })).on('data', (text: string) => {
      commands.push({ t: simNow(), text });
      wake();
    });
    const aborted = new Promise<void>((r) => opts.signal?.addEventListener('abort', () => r(), { once: true }));
    opts.onReady(pair.hostPath);
    if (opts.startOnCommand) {
      if (commands.length === 0) await Promise.race([new Promise<void>((r) => (wake = r)), aborted]);
      t0 = now();
      for (const c of commands) c.t = 0;
    }
    while (!opts.signal?.aborted) {
      for (const c of commands.splice(0)) device.command(c.t, c.text);
      const t = simNow();
      for (const l of await device.linesUntil(t)) {
        opts.onSent?.(l.line);
        if (sc.faults.lost_lines && wireRng.chance(sc.faults.lost_lines.probability)) {
          counts.lines_lost++;
          continue;
        }
        let line = l.line;
        if (sc.faults.corrupt && wireRng.chance(sc.faults.corrupt.probability)) {
          line = corruptLine(line, wireRng);
          counts.lines_corrupted++;
        }
        counts.lines_journaled++;
        if (!port.write(`${line}\n`)) await new Promise((r) => port.once('drain', r));
      }
      const due = device.nextAt(t);
      if (due === Infinity) break;
      const waitMs = ((due - simNow()) * 1000) / opts.speed;
      if (waitMs > 0) await Promise.race([sleep(Math.min(waitMs, 1000)), new Promise<void>((r) => (wake = r)), aborted]);
    }
    truth.complete = !opts.signal?.aborted;
    return truth;
  } finally {
    await new Promise<void>((r) => (port.isOpen ? port.close(() => r()) : r()));
    await pair.close();
  }
}
