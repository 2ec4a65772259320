// A scenario's device played by the shipped firmware in simavr: the run's pin edges (every channel, with the
// gate's own faults) reach the firmware's inputs on the device's clock, and its UART lines come back on the
// host clock, ready for the same link model (serial timing, USB, wire faults) as the device model's lines.
import { DeviceClock } from '../device-clock.ts';
import type { DeviceLine } from '../device.ts';
import type { PinEdge } from '../optics.ts';
import { prepareRun, type Run, type SimOptions } from '../simulate.ts';
import type { Scenario } from '../scenario.ts';
import { DEFAULT_BAUD, EMULATOR_CHANNEL_LATENCY_TICKS } from '../../protocol/link-defaults.ts';
import { FirmwareProcess } from './firmware-process.ts';
import { EMULATOR_HZ } from './run-firmware.ts';
import { buildEmulatorParts, missingToolchain, TOOLCHAIN_PACKAGES } from './toolchain.ts';

/** The emulator toolchain is missing or the firmware would not build: the message says what to install. */
export class EmulatorUnavailable extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'EmulatorUnavailable';
  }
}

/**
 * Input levels at power-on: the inputs have pull-ups (firmware/src/board.h BOARD_INPUT_PULLUPS), so an
 * unconnected channel reads high, as the device model assumes.
 */
const IDLE_LEVEL = 1;

/** Builds the firmware and the harness if needed; throws EmulatorUnavailable with a one-line reason. */
export function ensureEmulator(): void {
  const missing = missingToolchain();
  if (missing.length > 0) {
    throw new EmulatorUnavailable(`the firmware emulator needs ${missing.join(', ')} (install: apt-get install ${TOOLCHAIN_PACKAGES})`);
  }
  try {
    buildEmulatorParts();
  } catch (e) {
    throw new EmulatorUnavailable(`building the firmware or the emulator harness failed: ${(e as Error).message.split('\n')[1] ?? (e as Error).message}`);
  }
}

/**
 * Emulated time from power-on to the hello's first byte: the firmware waits two 16 ms watchdog periods for
 * its boot id first (measured 33.4 ms in simavr; on silicon the watchdog's RC oscillator makes it vary).
 */
const FIRMWARE_HELLO_S = 0.0332;

/**
 * A run prepared for the emulated firmware: the toolchain checked and built, the truth's capture latency
 * the emulated part's (simavr models no synchroniser or noise canceller: ch0 reads 0, not 4). The link runs
 * at the shipped build's baud rate; a scenario asking for another is refused (the shipped HEX is built for
 * one rate, and a run at a rate the firmware does not speak would not be that firmware's run).
 */
export function prepareFirmwareRun(base: Scenario, opts: SimOptions): Run {
  if (base.device.baud !== DEFAULT_BAUD) {
    throw new EmulatorUnavailable(`the shipped firmware links at ${DEFAULT_BAUD} baud, the scenario's device at ${base.device.baud}: set device.baud to ${DEFAULT_BAUD} in the scenario, or run without --firmware`);
  }
  ensureEmulator();
  const device = { ...base.device, capture_latency_ticks: EMULATOR_CHANNEL_LATENCY_TICKS[0], baud: DEFAULT_BAUD };
  const emulated = { ...base, device };
  const run = prepareRun(emulated, opts);
  run.truth.device = 'emulated firmware';
  return run;
}

/**
 * The emulated part against the run's host clock. The part powers on FIRMWARE_HELLO_S before the run's
 * first boot (scenario device.first_boot_s, where the model's device comes up), so its hello and armed
 * channels come about when the model's do. Emulated cycle c is device tick c − originCycle of a clock with
 * the scenario's ppm and drift and phase 0 at that boot: the firmware sees every edge at the tick the
 * modelled device would.
 */
export class FirmwareDevice {
  private readonly clock: DeviceClock;
  private readonly originCycle: number;
  private readonly fw: FirmwareProcess;
  private readonly edges: Iterator<PinEdge>;
  private nextEdge: PinEdge | undefined;
  private cycle = 0;
  private started = false;
  /** Every change as the harness applied it (cycle, channel, level), when asked to keep them. */
  readonly applied: { cycle: number; ch: 0 | 1; level: 0 | 1 }[] = [];

  constructor(
    private readonly run: Run,
    private readonly keepApplied = false,
  ) {
    const d = run.scenario.device;
    if (d.hz !== EMULATOR_HZ) throw new EmulatorUnavailable(`the emulated part runs at ${EMULATOR_HZ} Hz; the scenario's device has hz=${d.hz}`);
    const boot = d.first_boot_s;
    const lead = Math.min(FIRMWARE_HELLO_S, boot);
    this.clock = new DeviceClock(d.hz, d.ppm, d.drift_ppm_per_h, boot, 0);
    this.originCycle = Math.round(lead * EMULATOR_HZ);
    this.fw = new FirmwareProcess({ hostBaud: d.baud });
    this.edges = run.edges();
    this.pull();
  }

  /** Host time of an emulated cycle. */
  hostTimeOf(cycle: number): number {
    return this.clock.timeAt(cycle - this.originCycle);
  }

  /** Emulated cycle at a host time. */
  cycleOf(t: number): number {
    return Math.round(this.clock.ticksAt(t)) + this.originCycle;
  }

  /**
   * A host command line (without LF) whose LF reaches the device at host time t (as the model takes it); its
   * bytes start one byte time each earlier, but not before the part's present cycle.
   */
  command(t: number, text: string): void {
    const bytes = `${text}\n`;
    const byteCycles = (EMULATOR_HZ * 10) / this.run.scenario.device.baud;
    this.fw.send(Math.max(Math.round(this.cycleOf(t) - (bytes.length - 1) * byteCycles), this.cycle), bytes);
  }

  /** Runs the firmware to host time t; the lines it finished meanwhile, each at the host time it began. */
  async advance(t: number): Promise<DeviceLine[]> {
    if (!this.started) this.powerOn();
    const target = Math.max(this.cycleOf(t), this.cycle);
    for (; this.nextEdge && this.nextEdge.t <= t; this.pull()) {
      const e = this.nextEdge;
      this.fw.change(Math.max(this.cycleOf(e.t), 1), this.channelOf(e), e.level);
    }
    const chunk = await this.fw.runTo(target);
    this.cycle = chunk.cycle;
    if (this.keepApplied) this.applied.push(...chunk.applied);
    const counts = this.run.truth.faults.counts;
    return chunk.lines.map((l) => {
      counts.lines_sent++;
      this.noteLine(l.text);
      return { t: this.hostTimeOf(l.firstCycle), line: l.text };
    });
  }

  /** Cycle at which the firmware started Timer1 (its tick 0), once it has. */
  get timer1StartCycle(): number | undefined {
    return this.fw.timer1StartCycle;
  }

  async close(): Promise<void> {
    await this.fw.close();
  }

  /** Levels before the part's first cycle become its power-on levels. */
  private powerOn(): void {
    this.started = true;
    const levels = [IDLE_LEVEL, IDLE_LEVEL];
    levels[this.channelOf({})] = this.run.initialLevel;
    for (const o of this.run.otherLevels) levels[this.channelOf(o)] = o.level;
    const t0 = this.hostTimeOf(0);
    for (; this.nextEdge && this.nextEdge.t <= t0; this.pull()) levels[this.channelOf(this.nextEdge)] = this.nextEdge.level;
    levels.forEach((level, ch) => this.fw.change(0, ch as 0 | 1, level as 0 | 1));
    this.run.truth.clock.boots.push({ host_s: this.run.scenario.device.first_boot_s, boot_id: -1, phase_ticks: 0, cause: 'power' });
  }

  /** Truth from the firmware's own lines: its boot id and the clock origin, its captured and lost edges. */
  private noteLine(text: string): void {
    const counts = this.run.truth.faults.counts;
    if (text.startsWith('E ')) counts.edges_captured++;
    const hello = /^H [0-9a-f]+ .* boot=([0-9a-f]{4})/.exec(text);
    if (hello) {
      const boot = this.run.truth.clock.boots.at(-1)!;
      const t1 = this.fw.timer1StartCycle ?? 0;
      this.run.truth.clock.boots[this.run.truth.clock.boots.length - 1] = { ...boot, boot_id: parseInt(hello[1]!, 16), phase_ticks: this.originCycle - t1 };
    }
    const beat = /^T [0-9a-f]+ [0-9a-f]+ ([0-9a-f]+) /.exec(text);
    if (beat) counts.edges_lost_by_device = parseInt(beat[1]!, 16);
  }

  private channelOf(e: { readonly ch?: number }): 0 | 1 {
    const ch = e.ch ?? this.run.scenario.rig.beams[0].channel;
    if (ch !== 0 && ch !== 1) throw new EmulatorUnavailable(`the emulated board has channels 0 and 1 only, not ${ch}`);
    return ch;
  }

  private pull(): void {
    const r = this.edges.next();
    this.nextEdge = r.done ? undefined : r.value;
  }
}
