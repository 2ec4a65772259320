// The shipped firmware behind a pseudo-terminal: emulated in step with the (injected) wall clock, so the
// host's recorder, probe and live view talk to the real firmware's bytes and replies.
import { servePtyDevice, type PtyOptions } from '../outlets/pty.ts';
import type { Scenario } from '../scenario.ts';
import type { Truth } from '../truth.ts';
import { FirmwareDevice, prepareFirmwareRun } from './firmware-device.ts';

/** Wall time between two advances of the emulator: a line waits at most this long after the firmware sent it. */
const POLL_MS = 5;

/**
 * Serves the scenario's run with the firmware as its device on a pty until the run ends or the signal
 * aborts. Throws EmulatorUnavailable (toolchain missing) before the pty is opened.
 */
export async function serveFirmwarePty(base: Scenario, opts: PtyOptions): Promise<Truth> {
  const run = prepareFirmwareRun(base, opts);
  const device = new FirmwareDevice(run);
  const tEnd = run.scenario.duration_s;
  const pollS = (POLL_MS / 1000) * opts.speed;
  try {
    return await servePtyDevice(
      {
        command: (t, text) => device.command(Math.min(t, tEnd), text),
        linesUntil: (t) => device.advance(Math.min(t, tEnd)),
        nextAt: (t) => (t >= tEnd ? Infinity : Math.min(t + pollS, tEnd)),
      },
      run.scenario,
      run.truth,
      opts,
    );
  } finally {
    await device.close();
  }
}
