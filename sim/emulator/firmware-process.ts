// The firmware running in simavr as a long-lived process (harness --stream): input changes and host bytes
// in, UART lines out, emulated time advanced only on request, so a run can be of any length or paced live.
import { spawn, type ChildProcessWithoutNullStreams } from 'node:child_process';
import { createInterface, type Interface } from 'node:readline';
import { FIRMWARE_ELF, HARNESS_BIN } from './toolchain.ts';
import type { AppliedChange } from './run-firmware.ts';

/** One line the firmware sent: its bytes without the LF (latin1), the cycles of its first byte and of its LF. */
export interface UartLine {
  readonly firstCycle: number;
  readonly endCycle: number;
  readonly text: string;
}

/** What one run request produced. */
export interface RunChunk {
  readonly lines: UartLine[];
  readonly applied: AppliedChange[];
  /** The cycle the emulator reached (the request's, or where the part stopped). */
  readonly cycle: number;
}

export interface FirmwareProcessOptions {
  readonly elfPath?: string;
  /** Host side baud rate, for pacing host bytes into the firmware's receiver. */
  readonly hostBaud?: number;
}

/** The harness process. Requests are strictly in order: changes and bytes, then runTo, awaited before the next. */
export class FirmwareProcess {
  private readonly proc: ChildProcessWithoutNullStreams;
  private readonly out: Interface;
  private readonly replies: string[] = [];
  private waiting: (() => void) | undefined;
  private stderr = '';
  private exited: string | undefined;
  private lastChange = 0;
  /** Cycle at which the firmware started Timer1 (its tick 0); undefined until it has. */
  timer1StartCycle: number | undefined;

  constructor(o: FirmwareProcessOptions = {}) {
    const args = ['--stream', '--elf', o.elfPath ?? FIRMWARE_ELF, '--info-out', '/dev/null', '--host-baud', String(o.hostBaud ?? 250_000)];
    this.proc = spawn(HARNESS_BIN, args, { stdio: ['pipe', 'pipe', 'pipe'] });
    this.proc.stderr.on('data', (b: Buffer) => (this.stderr = (this.stderr + b.toString()).slice(-2000)));
    this.proc.on('exit', (code, signal) => {
      this.exited = `the emulator stopped (${signal ?? `exit ${code}`}): ${this.stderr.trim().split('\n').at(-1) ?? ''}`;
      this.waiting?.();
    });
    this.proc.stdin.on('error', () => undefined); // a dead harness is reported by runTo
    this.out = createInterface({ input: this.proc.stdout });
    this.out.on('line', (l) => {
      this.replies.push(l);
      if (l.startsWith('d ')) this.waiting?.();
    });
  }

  /** An input level change at an emulated cycle; cycles must not decrease. */
  change(cycle: number, ch: 0 | 1, level: 0 | 1): void {
    if (cycle < this.lastChange) throw new RangeError(`input changes must not go back in time (${cycle} < ${this.lastChange})`);
    this.lastChange = cycle;
    this.proc.stdin.write(`e ${cycle} ${ch} ${level}\n`);
  }

  /** Host bytes fed to the firmware's receiver from `cycle` on, at the host's byte rate. */
  send(cycle: number, bytes: string): void {
    this.proc.stdin.write(`c ${cycle} ${Buffer.from(bytes, 'latin1').toString('hex')}\n`);
  }

  /** Runs the part to `cycle`; resolves with every line finished and every change applied on the way. */
  async runTo(cycle: number): Promise<RunChunk> {
    if (this.exited) throw new Error(this.exited);
    const done = new Promise<void>((r) => (this.waiting = r));
    this.proc.stdin.write(`r ${Math.round(cycle)}\n`);
    await done;
    this.waiting = undefined;
    if (!this.replies.some((l) => l.startsWith('d '))) throw new Error(this.exited ?? 'the emulator stopped');
    const chunk: { lines: UartLine[]; applied: AppliedChange[]; cycle: number } = { lines: [], applied: [], cycle: 0 };
    for (const l of this.replies.splice(0)) {
      const f = l.split(' ');
      if (f[0] === 'l') chunk.lines.push({ firstCycle: Number(f[1]), endCycle: Number(f[2]), text: Buffer.from(f[3]!, 'hex').toString('latin1').replace(/\n$/, '') });
      else if (f[0] === 'a') chunk.applied.push({ cycle: Number(f[1]), ch: Number(f[2]) as 0 | 1, level: Number(f[3]) as 0 | 1 });
      else if (f[0] === 't') this.timer1StartCycle = Number(f[1]);
      else if (f[0] === 'd') chunk.cycle = Number(f[1]);
    }
    return chunk;
  }

  /** Stops the process (idempotent). */
  async close(): Promise<void> {
    this.out.close();
    if (this.proc.exitCode !== null || this.proc.signalCode !== null) return;
    const gone = new Promise((r) => this.proc.once('exit', r));
    this.proc.stdin.end('q\n');
    const timer = setTimeout(() => this.proc.kill('SIGKILL'), 2000);
    await gone;
    clearTimeout(timer);
  }
}
