// Per-test set-up for recorder tests: a temp folder, pty cables and recorder children, all cleaned up after.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach } from 'vitest';
import { simulateEntries, type Scenario, type SimOptions } from '../../../sim/index.ts';
import { PtyCable } from './pty-device.ts';
import { startRecorder, type RecorderChild } from './recorder-process.ts';

export interface PtyFixture {
  /** This test's temporary folder. */
  dir(): string;
  /** A new cable (pty) at `<dir>/<name>`. */
  plug(name?: string): Promise<PtyCable>;
  /** The cables plugged so far in this test, oldest first. */
  cables(): readonly PtyCable[];
  /** Starts `halfswing record` with the fixture's default options first. */
  record(args: string[], opts?: { closedStdin?: boolean }): RecorderChild;
  /** Writes a scenario's rig (as the simulator puts it in its journal) to `<dir>/rig.json`. */
  rigFile(sc: Scenario, sim: SimOptions): string;
}

/** Registers beforeEach/afterEach hooks; `defaults` go before each recorder's own arguments. */
export function usePtyFixture(prefix: string, defaults: readonly string[]): PtyFixture {
  let dir = '';
  let cables: PtyCable[] = [];
  let children: RecorderChild[] = [];
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), prefix));
  });
  afterEach(async () => {
    for (const c of children) if (c.proc.exitCode === null) c.proc.kill('SIGKILL');
    for (const c of cables) await c.kill();
    cables = [];
    children = [];
    rmSync(dir, { recursive: true, force: true });
  });
  return {
    dir: () => dir,
    async plug(name = 'ttyBOARD') {
      const c = await PtyCable.plug(join(dir, name));
      cables.push(c);
      return c;
    },
    cables: () => cables,
    record(args, opts = {}) {
      const c = startRecorder([...defaults, ...args], opts);
      children.push(c);
      return c;
    },
    rigFile(sc, sim) {
      const rigLine = simulateEntries(sc, sim).header.find((l) => l.startsWith('#rig '))!;
      const p = join(dir, 'rig.json');
      writeFileSync(p, rigLine.slice(5));
      return p;
    },
  };
}

/** Resolves at the recorder's first command on this cable: its port is open (and flushed), so the board can start. */
export function firstCommand(cable: PtyCable): Promise<string> {
  return new Promise((r) => cable.onCommand(r));
}
