// The watch feed: a journal followed while `record` writes it, or replayed at a speed; never touches a port.
import type { JournalEntry } from '../../../protocol/journal.ts';
import type { FollowOptions } from '../../journal/follow-journal.ts';
import type { Feed, FeedStatus } from '../feed.ts';

export interface JournalFeedOptions {
  readonly path: string;
  /** Replay speed (× real time); without it the journal is followed as it grows. */
  readonly speed?: number;
  /** The journal follower (host/journal/follow-journal.ts), injected for tests. */
  readonly follow: (path: string, opts: FollowOptions) => AsyncIterable<JournalEntry>;
  /** The file's current size in bytes, or null when it cannot be read. */
  readonly sizeOf: (path: string) => number | null;
  readonly nowMs: () => number;
}

/** Size checks at most this often: status() is read on every frame. */
const SIZE_EVERY_MS = 1000;

export function journalFeed(opts: JournalFeedOptions): Feed {
  const abort = new AbortController();
  const replay = opts.speed !== undefined;
  let ended: string | null = null;
  let size: number | null = null;
  let sizeAt = -Infinity;
  let resets = 0;
  async function* entries(): AsyncGenerator<JournalEntry> {
    yield* opts.follow(opts.path, {
      follow: !replay,
      ...(replay ? { speed: opts.speed } : {}),
      waitForFile: !replay,
      signal: abort.signal,
      onReset: () => resets++,
    });
    ended = abort.signal.aborted ? 'stopped' : 'end of journal';
  }
  return {
    entries: entries(),
    status(): FeedStatus {
      const now = opts.nowMs();
      if (now - sizeAt >= SIZE_EVERY_MS) {
        size = opts.sizeOf(opts.path);
        sizeAt = now;
      }
      return {
        sourceKind: 'watch',
        sourceLabel: resets > 0 ? `${opts.path} (re-read ${resets}×)` : opts.path,
        speed: replay ? opts.speed! : null,
        connection: ended ? { kind: 'ended', why: ended } : replay ? { kind: 'replaying' } : { kind: 'following' },
        journal: size !== null ? { path: opts.path, bytes: size } : null,
        writesJournal: false,
      };
    },
    async close() {
      abort.abort();
    },
  };
}
