// A simulated board for pty tests: the simulator's device model, paced onto a PtyCable, recording what it sent.
import type { DeviceModel } from '../../../sim/device.ts';
import { simulateDevice, type Scenario, type SimOptions } from '../../../sim/index.ts';
import type { PtyCable } from './pty-device.ts';

export class SimBoard {
  readonly device: DeviceModel;
  /** Device lines written to a cable, in order (garbage excluded). */
  readonly sent: string[] = [];
  /** Lines the board sent while no cable was attached (lost, as on a pulled cable). */
  dropped = 0;
  /** Host commands received so far. */
  commands = 0;
  private cable: PtyCable | undefined;
  private simT = 0;
  private gate: Promise<void> | undefined;
  private stopped = false;
  private lastWallMs = performance.now();
  private wake: (() => void) | undefined;
  private openGate: (() => void) | undefined;

  constructor(
    scenario: Scenario,
    opts: SimOptions,
    /** N× real time; Infinity: as fast as the pty takes them. */
    private readonly speed: number,
  ) {
    this.device = simulateDevice(scenario, opts).device;
  }

  attach(cable: PtyCable): void {
    this.cable = cable;
    // Host commands reach the model at the board's current time, as the firmware would see them.
    cable.onCommand((cmd) => {
      this.commands++;
      this.device.command(this.simT, cmd);
      // A reply is due now: cut the wait for the next line short.
      this.wake?.();
    });
  }

  detach(): void {
    this.cable = undefined;
  }

  /** Holds the board's output after the line in flight (the model's time stands still too). */
  pause(): void {
    this.gate ??= new Promise((r) => (this.openGate = r));
  }

  /** Ends `run` after the line in flight. */
  stop(): void {
    this.stopped = true;
    this.resume();
  }

  resume(): void {
    const open = this.openGate;
    this.gate = undefined;
    this.openGate = undefined;
    open?.();
  }

  /** The board's clock: host seconds of the last line it produced. */
  get now(): number {
    return this.simT;
  }

  /**
   * Runs the board until host time `untilS` (or the end of the run), pacing each line after the previous one
   * by Δt / speed (after a pause the board catches up at once). `between(i)` may return garbage to write before the i-th line.
   */
  async run(untilS = Infinity, between?: (i: number) => string | Buffer | undefined): Promise<void> {
    for (;;) {
      if (this.gate) await this.gate;
      if (this.stopped) return;
      const due = this.device.peekTime();
      if (due === Infinity || due >= untilS) return;
      // Paced from the wall time of the previous line, so a wake-up for a command does not stretch the gap.
      const waitMs = this.lastWallMs + ((due - this.simT) * 1000) / this.speed - performance.now();
      if (waitMs >= 1) {
        const woken = await new Promise<boolean>((r) => {
          const t = setTimeout(() => r(false), waitMs);
          this.wake = () => {
            clearTimeout(t);
            r(true);
          };
        });
        this.wake = undefined;
        if (woken) continue;
      }
      // As fast as possible must still let the commands and the pipe's drain events in.
      if (this.sent.length % 512 === 0) await new Promise((r) => setImmediate(r));
      const l = this.device.pop()!;
      this.simT = l.t;
      this.lastWallMs = performance.now();
      if (!this.cable) {
        this.dropped++;
        continue;
      }
      const junk = between?.(this.sent.length);
      if (junk !== undefined) await this.cable.write(junk);
      this.sent.push(l.line);
      await this.cable.write(`${l.line}\n`);
    }
  }
}
