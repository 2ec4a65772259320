// The watch feed: a journal followed while `record` writes it, or replayed at a speed; never touches a port.
// A journal whose last entry is the recorder's `stop` annotation (protocol/JOURNAL.md) is a finished recording:
// the feed says it ended and when, so the view stops its run clock there and raises no "no passes" or "no
// heartbeat" for the time since. Anything after the stop (a resumed recorder's new section) makes it live again.
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

/** Where the journal's newest section stands: its wall-clock start and, when it ended, the recorder's stop. */
export interface RecordingEnd {
  readonly at_s: number;
  readonly why: string;
  /** Wall-clock time of the stop (the section's `#start` + its host time), or null without a usable `#start`. */
  readonly iso: string | null;
}

/** Tracks the newest section's start and its `stop` annotation over the entries, in order (pure). */
export function recordingEndTracker(): { see(e: JournalEntry): void; end(): RecordingEnd | null } {
  let startMs: number | null = null;
  let end: RecordingEnd | null = null;
  return {
    see(e) {
      if (e.kind === 'start') {
        startMs = Number.isFinite(e.epochMs) ? e.epochMs : null;
        end = null;
      } else if (e.kind === 'annotation' && e.word === 'stop') {
        end = { at_s: e.hostUs / 1e6, why: e.text, iso: startMs !== null ? new Date(startMs + e.hostUs / 1000).toISOString() : null };
      } else if (e.kind === 'data') end = null;
    },
    end: () => end,
  };
}

/** "recording ended 2026-12-05 17:40:12 UTC (shutdown (SIGTERM))". */
export function endedWords(e: RecordingEnd): string {
  const when = e.iso !== null ? ` ${e.iso.slice(0, 10)} ${e.iso.slice(11, 19)} UTC` : '';
  return `recording ended${when}${e.why ? ` (${e.why})` : ''}`;
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
  const recording = recordingEndTracker();
  async function* entries(): AsyncGenerator<JournalEntry> {
    for await (const e of opts.follow(opts.path, {
      follow: !replay,
      ...(replay ? { speed: opts.speed } : {}),
      waitForFile: !replay,
      signal: abort.signal,
      onReset: () => resets++,
    })) {
      recording.see(e);
      yield e;
    }
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
      const stop = recording.end();
      return {
        sourceKind: 'watch',
        sourceLabel: resets > 0 ? `${opts.path} (re-read ${resets}×)` : opts.path,
        speed: replay ? opts.speed! : null,
        connection:
          stop ? { kind: 'ended', why: endedWords(stop) } : ended ? { kind: 'ended', why: ended } : replay ? { kind: 'replaying' } : { kind: 'following' },
        journal: size !== null ? { path: opts.path, bytes: size } : null,
        writesJournal: false,
      };
    },
    async close() {
      abort.abort();
    },
  };
}
