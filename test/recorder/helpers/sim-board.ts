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
    });
  }

  detach(): void {
    this.cable = undefined;
  }

  /** Holds the board's output after the line in flight (the model's time stands still too). */
  pause(): void {
    this.gate ??= new Promise((r) => (this.openGate = r));
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
   * by Δt / speed. `between(i)` may return garbage to write before the i-th line.
   */
  async run(untilS = Infinity, between?: (i: number) => string | Buffer | undefined): Promise<void> {
    for (;;) {
      if (this.gate) await this.gate;
      const due = this.device.peekTime();
      if (due === Infinity || due >= untilS) return;
      const waitMs = ((due - this.simT) * 1000) / this.speed;
      if (waitMs >= 1) await new Promise((r) => setTimeout(r, waitMs));
      // As fast as possible must still let the commands and the pipe's drain events in.
      if (this.sent.length % 512 === 0) await new Promise((r) => setImmediate(r));
      const l = this.device.pop()!;
      this.simT = l.t;
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
