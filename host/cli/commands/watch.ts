// `halfswing watch JOURNAL`: follow a journal that `record` is writing, or replay a finished one, in the live view.
import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Command } from '../command.ts';
import { optNumber } from '../command.ts';
import { UserError } from '../../errors.ts';
import { isJournalMagic } from '../../../protocol/journal.ts';
import { processViewIo } from './view-process.ts';

export const command: Command = {
  name: 'watch',
  summary: 'follow or replay a journal on screen, never touching the port',
  usage: 'watch JOURNAL [--speed N]',
  positionals: [1, 1],
  options: {
    speed: { type: 'string', arg: 'N', description: 'replay a finished journal at N× real time (without it: follow the file as it grows)' },
    wait: { type: 'boolean', description: 'wait for the journal to appear if the recorder has not created it yet' },
  },
  details: `
Following: reads what is in the journal, then shows each new line as the recorder appends it; waits for the
file with --wait if the recorder has not created it yet. The port stays with the recorder: start and stop watch freely.
A journal that ends with the recorder's stop is a finished recording: the view says when it ended, its run
clock stops there, and no "no passes" or "no heartbeat" warning counts the time since. A journal that ends
without one (sim output, a recorder killed or cut off) is shown as "not being written since" its last line once
it has not grown for a few seconds and that line is older than three heartbeat periods; it is live again when it grows.
Replaying (--speed): plays the journal at its own pace, N times faster, and stops at its end.
Keys: q quit, p pause the display, r restart the estimates from now, ? help.`,
  async run(args, io) {
    const speed = optNumber(args, 'speed', { min: 0.01, max: 1_000_000 });
    const path = resolve(io.cwd, args.positionals[0]!);
    checkJournal(path, speed === undefined && args.values.wait === true);
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
      wallMs: () => Date.now(),
    });
    return runLiveView({ feed, createPipeline: () => createRunPipeline(), ...pio });
  },
};

/** Refuses, before the view starts, a path that is missing (unless waiting for it) or is not a journal. */
function checkJournal(path: string, mayWait: boolean): void {
  let size: number;
  try {
    const st = statSync(path);
    if (st.isDirectory()) throw new UserError(`${path} is a folder, not a journal file`);
    size = st.size;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw e;
    if (mayWait) return;
    throw new UserError(`no such journal: ${path} (add --wait to wait for a recorder to create it)`);
  }
  if (size === 0) return;
  const fd = openSync(path, 'r');
  const buf = Buffer.alloc(64);
  const n = readSync(fd, buf, 0, buf.length, 0);
  closeSync(fd);
  const head = buf.toString('latin1', 0, n);
  const nl = head.indexOf('\n');
  if (nl < 0 && n < buf.length) return; // the recorder is writing the first line
  if (!isJournalMagic(nl < 0 ? head : head.slice(0, nl))) throw new UserError(`${path} is not a halfswing journal (its first line is not '#halfswing-journal 1')`);
}
