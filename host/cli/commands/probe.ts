// `halfswing probe`: checks a board: hello, reply to '?', heartbeat regularity, line errors, present gate levels.
import { DEFAULT_BAUD } from '../../../protocol/link-defaults.ts';
import { openDeviceLink } from '../../link/device-link.ts';
import { monotonicClock } from '../../link/monotonic-clock.ts';
import { formatProbe, probeBoard } from '../../link/probe-report.ts';
import { optNumber, optString, type Command } from '../command.ts';
import { loadRigFile } from '../rig-file.ts';

export const command: Command = {
  name: 'probe',
  summary: 'check a board: hello, heartbeats, line errors, gate levels',
  usage: 'probe [--port P|auto] [options]',
  options: {
    port: { type: 'string', arg: 'P', description: "serial port, or 'auto' for the one board attached", default: 'auto' },
    baud: { type: 'string', arg: 'N', description: 'serial speed; must match the firmware', default: String(DEFAULT_BAUD) },
    seconds: { type: 'string', arg: 'S', description: 'how long to listen to heartbeats', default: '5' },
    rig: { type: 'string', arg: 'FILE', description: "rig file, to say whether the pendulum's beam is blocked now" },
    'hello-timeout': { type: 'string', arg: 'S', description: 'seconds to wait for the board to say hello', default: '5' },
    json: { type: 'boolean', description: 'print the report as JSON' },
  },
  details: `
Opening the port resets most boards (DTR), so the first hello comes after the bootloader, 1 to 3 s.
Block and unblock the beam by hand during the probe and run it again to see the gate levels change.
Exit status 0 when the board looks healthy, 1 when the report lists problems.`,
  async run(args, io) {
    const rigPath = optString(args, 'rig');
    const rig = rigPath ? loadRigFile(rigPath, io.cwd, (line) => void io.stderr.write(`${line}\n`)) : undefined;
    const now = monotonicClock();
    const link = openDeviceLink({
      port: optString(args, 'port') ?? 'auto',
      baud: optNumber(args, 'baud', { min: 300, max: 4_000_000, integer: true })!,
      helloTimeoutMs: optNumber(args, 'hello-timeout', { min: 0.1, max: 600 })! * 1000,
      now,
    });
    try {
      const report = await probeBoard({ link, seconds: optNumber(args, 'seconds', { min: 0.5, max: 3600 })!, now });
      io.stdout.write(args.values.json ? `${JSON.stringify(report, null, 2)}\n` : `${formatProbe(report, rig).join('\n')}\n`);
      return report.problems.length ? 1 : 0;
    } finally {
      await link.close();
    }
  },
};
