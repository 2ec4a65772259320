// The demo's feed: simulated journal lines paced in real time (× speed), as journal entries.
import { parseJournalLine, type JournalEntry } from '../../../protocol/journal.ts';
import type { Feed, FeedStatus } from '../feed.ts';

export interface SimFeedOptions {
  /** The simulated journal's lines, header first (simulateJournal). */
  readonly lines: Iterable<string>;
  readonly scenarioName: string;
  readonly speed: number;
  /** The simulator's pacer (sim/pace.ts `paceLines`), injected so tests can run unpaced. */
  readonly pace: (lines: Iterable<string>, opts: { speed: number; signal: AbortSignal }) => AsyncIterable<string>;
}

/** A feed over a simulated run; `close` stops the pacer at once. */
export function simFeed(opts: SimFeedOptions): Feed {
  const abort = new AbortController();
  let ended: string | null = null;
  async function* entries(): AsyncGenerator<JournalEntry> {
    for await (const line of opts.pace(opts.lines, { speed: opts.speed, signal: abort.signal })) yield parseJournalLine(line);
    ended = abort.signal.aborted ? 'stopped' : 'end of the simulated run';
  }
  return {
    entries: entries(),
    status: (): FeedStatus => ({
      sourceKind: 'demo',
      sourceLabel: opts.scenarioName,
      speed: opts.speed,
      connection: ended ? { kind: 'ended', why: ended } : { kind: 'simulated' },
      journal: null,
      writesJournal: false,
    }),
    async close() {
      abort.abort();
    },
  };
}
