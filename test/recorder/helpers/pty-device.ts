// The far end of a pty for recorder tests: socat makes the pty, this process plays the board on socat's stdio.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { closeSync, existsSync, openSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';

/** True when socat is on PATH. Pty tests must fail, not skip, when it is missing under CI=true. */
export function haveSocat(): boolean {
  return spawnSync('socat', ['-V'], { stdio: 'ignore' }).status === 0;
}

/** Decides once whether pty tests run: missing socat skips with one line on a dev machine, fails under CI. */
export function ptyTestsEnabled(): boolean {
  if (haveSocat()) return true;
  if (process.env.CI === 'true') throw new Error('socat is missing and CI=true: pty tests must run (apt-get install socat)');
  // Several test files ask; the run (their common parent process) prints the line once.
  try {
    closeSync(openSync(join(tmpdir(), `halfswing-no-socat-${process.ppid}`), 'wx'));
    process.stderr.write('skipping pty recorder tests: socat is not installed (apt-get install socat)\n');
  } catch {
    // already said
  }
  return false;
}

/**
 * One "cable": `socat pty,link=PATH STDIO`. The recorder opens PATH; what this object writes arrives there and what
 * the recorder sends comes back through `onCommand`. `kill` is the cable pulled: the pty vanishes.
 */
export class PtyCable {
  private constructor(
    readonly path: string,
    private readonly proc: ChildProcess,
  ) {}

  private buffered = '';
  private commandFn: ((cmd: string) => void) | undefined;
  private heldBack: (() => void)[] = [];

  static async plug(path: string): Promise<PtyCable> {
    // A SIGKILLed socat leaves its link behind; a new one could not create it.
    rmSync(path, { force: true });
    const proc = spawn('socat', [`pty,raw,echo=0,link=${path}`, 'STDIO'], { stdio: ['pipe', 'pipe', 'ignore'] });
    const cable = new PtyCable(path, proc);
    proc.stdout!.setEncoding('latin1');
    proc.stdout!.on('data', (d: string) => cable.onData(d));
    proc.stdin!.on('error', () => {});
    for (let i = 0; i < 500 && !existsSync(path); i++) {
      if (proc.exitCode !== null) throw new Error(`socat exited with ${proc.exitCode}`);
      await new Promise((r) => setTimeout(r, 10));
    }
    if (!existsSync(path)) throw new Error('socat did not create its pty link');
    return cable;
  }

  onCommand(fn: (cmd: string) => void): void {
    this.commandFn = fn;
  }

  /** Writes bytes, waiting while the pty (and so the reader) pushes back. */
  async write(text: string | Buffer): Promise<void> {
    const stdin = this.proc.stdin!;
    if (!stdin.writable) return;
    // once() rejects on 'error': an EPIPE while waiting means socat is gone, i.e. the cable is pulled.
    if (stdin.write(text)) return;
    for (const f of this.heldBack.splice(0)) f();
    await Promise.race([once(stdin, 'drain'), once(this.proc, 'exit')]).catch(() => undefined);
  }

  /** Resolves the next time a write has to wait: the pty is full, so its reader has stopped taking lines. */
  whenHeldBack(): Promise<void> {
    return new Promise((r) => this.heldBack.push(r));
  }

  get alive(): boolean {
    return this.proc.exitCode === null && this.proc.signalCode === null;
  }

  async kill(signal: NodeJS.Signals = 'SIGKILL'): Promise<void> {
    if (!this.alive) return;
    const gone = once(this.proc, 'exit');
    this.proc.kill(signal);
    await gone;
  }

  private onData(d: string): void {
    this.buffered += d;
    let lf: number;
    while ((lf = this.buffered.indexOf('\n')) >= 0) {
      const cmd = this.buffered.slice(0, lf);
      this.buffered = this.buffered.slice(lf + 1);
      this.commandFn?.(cmd);
    }
  }
}
