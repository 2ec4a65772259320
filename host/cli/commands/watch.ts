// `halfswing watch JOURNAL`: follow a journal that `record` is writing, or replay a finished one, in the live view.
import { statSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Command } from '../command.ts';
import { optNumber } from '../command.ts';
import { processViewIo } from './view-process.ts';

export const command: Command = {
  name: 'watch',
  summary: 'follow or replay a journal on screen, never touching the port',
  usage: 'watch JOURNAL [--speed N]',
  positionals: [1, 1],
  options: {
    speed: { type: 'string', arg: 'N', description: 'replay a finished journal at N× real time (without it: follow the file as it grows)' },
  },
  details: `
Following: reads what is in the journal, then shows each new line as the recorder appends it; waits for the
file if the recorder has not created it yet. The port stays with the recorder: start and stop watch freely.
Replaying (--speed): plays the journal at its own pace, N times faster, and stops at its end.
Keys: q quit, p pause the display, r restart the estimates from now, ? help.`,
  async run(args, io) {
    const speed = optNumber(args, 'speed', { min: 0.01, max: 1_000_000 });
    const path = resolve(io.cwd, args.positionals[0]!);
    const { followJournal } = await import('../../journal/follow-journal.ts');
    const { journalFeed } = await import('../../tui/feeds/journal-feed.ts');
    const { runLiveView } = await import('../../tui/run-view.tsx');
    const { createRunPipeline } = await import('../../pipeline/run-pipeline.ts');
    const pio = processViewIo(io);
    const feed = journalFeed({
      path,
      ...(speed !== undefined ? { speed } : {}),
      follow: followJournal,
      sizeOf: (p) => {
        try {
          return statSync(p).size;
        } catch {
          return null;
        }
      },
      nowMs: pio.nowMs,
    });
    return runLiveView({ feed, createPipeline: () => createRunPipeline(), ...pio });
  },
};
