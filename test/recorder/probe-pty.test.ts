// `halfswing probe` end to end on a pty with the simulator's board at real time.
import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { loadScenario } from '../../sim/index.ts';
import { PtyCable, ptyTestsEnabled } from './helpers/pty-device.ts';
import { SimBoard } from './helpers/sim-board.ts';

const enabled = ptyTestsEnabled();
const BIN = fileURLToPath(new URL('../../bin/halfswing.js', import.meta.url));

let dir: string;
let cable: PtyCable | undefined;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-probe-'))));
afterEach(async () => {
  await cable?.kill();
  rmSync(dir, { recursive: true, force: true });
});

describe.skipIf(!enabled)('probe over a pty', () => {
  it('prints firmware, clock, channels, the reply to ?, heartbeat regularity, line errors and the gate levels', async () => {
    cable = await PtyCable.plug(join(dir, 'ttyP'));
    const rig = join(dir, 'rig.json');
    // The bob hangs at rest off the beam: the simulated gate reads clear (high for a blocked-low gate).
    writeFileSync(rig, JSON.stringify({ length_m: 1, flag_width_m: 0.02, blocked_level: 'low', channel: 0 }));
    const child = spawn(process.execPath, [BIN, 'probe', '--port', cable.path, '--seconds', '3.5', '--rig', rig], { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    await new Promise((r) => cable!.onCommand(r));
    const board = new SimBoard(loadScenario('ideal-60deg'), { seed: 3, durationS: 60, no_faults: true }, 1);
    board.attach(cable);
    const running = board.run();
    const [code] = await once(child, 'exit');
    board.stop();
    await running;
    expect(err, out).toBe("");
    expect(out).toMatch(/^firmware   halfswing \S+ on \S+, protocol 1, boot [0-9a-f]{4}$/m);
    expect(out).toMatch(/^clock      16000000 Hz nominal$/m);
    expect(out).toMatch(/^channels   2$/m);
    expect(out).toMatch(/^'\?' reply  \d+\.\d ms$/m);
    expect(out).toMatch(/^heartbeats \d+ in 3.5 s: every \d+\.\d ms .*expected 1000$/m);
    expect(out).toMatch(/^lines      \d+, rejected 0 \(0\.00 %\), missing 0$/m);
    expect(out).toMatch(/^gates      ch0 (high|low) \(beam (clear|BLOCKED)\), ch1 (high|low)$/m);
    expect(out).toMatch(/^verdict    looks healthy$/m);
    expect(code).toBe(0);
  });
});
