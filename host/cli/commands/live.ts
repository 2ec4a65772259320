// `halfswing live`: own the board's port, journal every line, and show the swing live.
import { resolve } from 'node:path';
import type { Command } from '../command.ts';
import { optString } from '../command.ts';
import { LINK_OPTIONS, linkSettings } from '../link-options.ts';
import { UserError } from '../../errors.ts';
import { processViewIo } from './view-process.ts';

/** A journal name from the start time, e.g. halfswing-20260105-090000.journal. */
export function defaultJournalName(start: Date): string {
  const iso = start.toISOString();
  return `halfswing-${iso.slice(0, 10).replace(/-/g, '')}-${iso.slice(11, 19).replace(/:/g, '')}.journal`;
}

export const command: Command = {
  name: 'live',
  summary: 'record from a board and show the swing live',
  usage: 'live --port P|auto --rig FILE [--journal FILE] [--baud N] [--hello-timeout S] [--keep-dtr]',
  options: {
    port: { type: 'string', short: 'p', arg: 'P|auto', description: 'serial port of the board, or auto to pick the one likely board' },
    rig: { type: 'string', short: 'r', arg: 'FILE', description: 'rig description (JSON): length, flag width, ...' },
    ...LINK_OPTIONS,
    journal: { type: 'string', short: 'o', arg: 'FILE', description: 'journal to write (appended to if it exists; default halfswing-<date>-<time>.journal here)' },
  },
  details: `
Every line from the board goes into the journal as it arrives, whatever the screen does; q asks before it stops
the recording. Keys: q quit, n note into the journal, p pause the display (recording goes on), r restart the
estimates from now, ? help. For long unattended runs use 'halfswing record' and watch it with 'halfswing watch'.`,
  async run(args, io) {
    const port = optString(args, 'port');
    const rigPath = optString(args, 'rig');
    if (!port) throw new UserError('live: give the board with --port P (or --port auto; halfswing ports lists them)', 2);
    if (!rigPath) throw new UserError('live: give the rig description with --rig FILE (length_m and flag_width_m at least)', 2);
    const { isSimpleRig, rigJson } = await import('../../../protocol/rig.ts');
    const { loadRigFile } = await import('../rig-file.ts');
    const rig = loadRigFile(rigPath, io.cwd, (line) => void io.stderr.write(`${line}\n`));

    const settings = linkSettings(args);
    const start = new Date();
    const journalPath = resolve(io.cwd, optString(args, 'journal') ?? defaultJournalName(start));
    const { openJournalWriter } = await import('../../journal/journal-writer.ts');
    // The journal opens first, so a bad path fails before the board is reset by opening its port.
    const writer = openJournalWriter(journalPath);
    const { openDeviceLink } = await import('../../link/device-link.ts');
    const { monotonicClock } = await import('../../link/monotonic-clock.ts');
    const { deviceFeed } = await import('../../tui/feeds/device-feed.ts');
    const { runLiveView } = await import('../../tui/run-view.tsx');
    const { createRunPipeline } = await import('../../pipeline/run-pipeline.ts');
    // No await between opening the link and subscribing to it: its first events must not be missed.
    const nowUs = monotonicClock();
    const link = openDeviceLink({ port, now: nowUs, ...settings });
    const feed = deviceFeed({ link, writer, nowUs, start, source: `halfswing live, port ${port}`, rigJson: rigJson(rig), portLabel: port });
    return runLiveView({ feed, createPipeline: () => createRunPipeline(isSimpleRig(rig) ? { rig } : {}), ...processViewIo(io) });
  },
};
