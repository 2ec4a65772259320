// `halfswing probe`: checks a board: hello, reply to '?', heartbeat regularity, line errors, present gate levels.
import { openDeviceLink } from '../../link/device-link.ts';
import { monotonicClock } from '../../link/monotonic-clock.ts';
import { formatProbe, probeBoard } from '../../link/probe-report.ts';
import { optNumber, optString, type Command } from '../command.ts';
import { LINK_OPTIONS, linkSettings } from '../link-options.ts';
import { loadRigFile } from '../rig-file.ts';

export const command: Command = {
  name: 'probe',
  summary: 'check a board: hello, heartbeats, line errors, gate levels',
  usage: 'probe [--port P|auto] [options]',
  options: {
    port: { type: 'string', arg: 'P', description: "serial port, or 'auto' for the one board attached", default: 'auto' },
    ...LINK_OPTIONS,
    seconds: { type: 'string', arg: 'S', description: 'how long to listen to heartbeats', default: '5' },
    rig: { type: 'string', arg: 'FILE', description: "rig file, to say whether the pendulum's beam is blocked now" },
    json: { type: 'boolean', description: 'print the report as JSON' },
  },
  details: `
Opening the port resets most boards (DTR), so the first hello comes after the bootloader, 1 to 3 s.
Block and unblock the beam by hand during the probe and run it again to see the gate levels change.
Exit status 0 when the board looks healthy, 1 when the report lists problems.`,
  async run(args, io) {
    const rigPath = optString(args, 'rig');
    // Only the beams and the blocked level matter here: no note on assumed uncertainties.
    const rig = rigPath ? loadRigFile(rigPath, io.cwd, () => {}) : undefined;
    const now = monotonicClock();
    const link = openDeviceLink({
      port: optString(args, 'port') ?? 'auto',
      ...linkSettings(args),
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
