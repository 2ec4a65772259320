// The watch feed: a journal followed while `record` writes it, or replayed at a speed; never touches a port.
// A journal whose last entry is the recorder's `stop` annotation (protocol/JOURNAL.md) is a finished recording:
// the feed says it ended and when, so the view stops its run clock there and raises no "no passes" or "no
// heartbeat" for the time since. Anything after the stop (a resumed recorder's new section) makes it live again.
// A journal that ends without a stop (sim output, a recorder killed or cut off by a power loss) is told by what a
// reader can know: it has not grown for a few seconds and its last line is older than the heartbeat cadence allows
// (writingState); it is then shown as not being written since its last line, and as live again once it grows.
import type { JournalEntry } from '../../../protocol/journal.ts';
import type { FollowOptions } from '../../journal/follow-journal.ts';
import { WARN } from '../../analysis/warning.ts';
import { heartbeatCadence } from '../heartbeat-cadence.ts';
import type { ConnectionState, Feed, FeedStatus } from '../feed.ts';

export interface JournalFeedOptions {
  readonly path: string;
  /** Replay speed (× real time); without it the journal is followed as it grows. */
  readonly speed?: number;
  /** The journal follower (host/journal/follow-journal.ts), injected for tests. */
  readonly follow: (path: string, opts: FollowOptions) => AsyncIterable<JournalEntry>;
  /** The file's current size in bytes, or null when it cannot be read. */
  readonly sizeOf: (path: string) => number | null;
  /** A monotonic clock (ms): how long the file has been quiet. */
  readonly nowMs: () => number;
  /** The wall clock (ms since 1970), to age the last line by the journal's `#start`; without it only the quiet time counts. */
  readonly wallMs?: () => number;
}

/** Where the journal's newest section stands: its wall-clock start and, when it ended, the recorder's stop. */
export interface RecordingEnd {
  readonly at_s: number;
  readonly why: string;
  /** Wall-clock time of the stop (the section's `#start` + its host time), or null without a usable `#start`. */
  readonly iso: string | null;
}

/** The newest section's last line: its host time, its wall-clock time (ms) when the `#start` gives one, and the heartbeat cadence seen. */
export interface LastLine {
  readonly host_s: number;
  readonly wallMs: number | null;
  /** Median spacing of the recent `T` lines' host times (s), or null before two. */
  readonly heartbeat_s: number | null;
  /** The last line is the recorder's `disconnect` annotation (it may be waiting for the board). */
  readonly afterDisconnect: boolean;
}

/** Tracks the newest section's start, last line, heartbeats and `stop` annotation over the entries, in order (pure). */
export function recordingEndTracker(): { see(e: JournalEntry): void; end(): RecordingEnd | null; last(): LastLine | null } {
  let startMs: number | null = null;
  let end: RecordingEnd | null = null;
  let last: { hostUs: number; afterDisconnect: boolean } | null = null;
  const beats = heartbeatCadence();
  return {
    see(e) {
      if (e.kind === 'start') {
        startMs = Number.isFinite(e.epochMs) ? e.epochMs : null;
        end = null;
        last = null;
        beats.reset();
      } else if (e.kind === 'annotation') {
        if (e.word === 'stop') end = { at_s: e.hostUs / 1e6, why: e.text, iso: startMs !== null ? new Date(startMs + e.hostUs / 1000).toISOString() : null };
        last = { hostUs: e.hostUs, afterDisconnect: e.word === 'disconnect' };
      } else if (e.kind === 'data') {
        end = null;
        last = { hostUs: e.hostUs, afterDisconnect: false };
        beats.see(e);
      }
    },
    end: () => end,
    last: () =>
      last && { host_s: last.hostUs / 1e6, wallMs: startMs !== null ? startMs + last.hostUs / 1000 : null, heartbeat_s: beats.interval_s(), afterDisconnect: last.afterDisconnect },
  };
}

/** "2026-12-05 17:40:12 UTC", with a leading space; empty without a time. */
const utc = (iso: string | null): string => (iso !== null ? ` ${iso.slice(0, 10)} ${iso.slice(11, 19)} UTC` : '');

/** "recording ended 2026-12-05 17:40:12 UTC (shutdown (SIGTERM))". */
export function endedWords(e: RecordingEnd): string {
  return `recording ended${utc(e.iso)}${e.why ? ` (${e.why})` : ''}`;
}

/**
 * "not being written since 2026-12-05 17:40:12 UTC" (its last line's time), "… after a disconnect" when that was
 * the last line; and the short wording for a narrow status line.
 */
export function notWrittenWords(last: LastLine): { why: string; short: string } {
  const since = last.wallMs !== null ? ` since${utc(new Date(last.wallMs).toISOString())}` : '';
  return { why: `not being written${since}${last.afterDisconnect ? ' after a disconnect' : ''}`, short: `not written${since}` };
}

/**
 * A reader's first look at a file the recorder has stopped writing: nothing new for this long (s). The recorder
 * writes every line as it arrives and fsyncs at least once a second (protocol/JOURNAL.md), and at the default
 * cadence a heartbeat comes every second, so three quiet seconds are three missed heartbeats.
 */
export const QUIET_S = 3;

/**
 * The longest a live recorder's journal stays quiet (s): three heartbeat periods, the link's own rule for a lost
 * link (protocol/SPEC.md), plus the second the writer may hold a line before its fsync. The default period is 1 s.
 */
export function quietAllowance(heartbeat_s: number | null): number {
  return WARN.silentHeartbeats * (heartbeat_s ?? 1) + 1;
}

/**
 * True when a followed journal is not being written: quiet for a few seconds, and its last line is older than the
 * heartbeat cadence allows, by the wall clock against the journal's `#start` (a stopped sim or a killed recorder
 * hours ago is told at once) or, when that clock cannot tell (no `#start`, a line stamped in the future, another
 * machine's clock), by the time this reader has itself seen nothing arrive.
 */
export function notBeingWritten(quiet_s: number, lastLineAge_s: number | null, heartbeat_s: number | null): boolean {
  const allowed = quietAllowance(heartbeat_s);
  return quiet_s >= QUIET_S && (quiet_s >= allowed || (lastLineAge_s !== null && lastLineAge_s > allowed));
}

/** Size checks at most this often: status() is read on every frame. */
const SIZE_EVERY_MS = 1000;

export function journalFeed(opts: JournalFeedOptions): Feed {
  const abort = new AbortController();
  const replay = opts.speed !== undefined;
  let ended: string | null = null;
  let size: number | null = null;
  let sizeAt = -Infinity;
  // When the file last grew: a line arrived, or its size changed.
  let grewMs = opts.nowMs();
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
      grewMs = opts.nowMs();
      yield e;
    }
    ended = abort.signal.aborted ? 'stopped' : 'end of journal';
  }
  const connection = (now: number): ConnectionState => {
    const stop = recording.end();
    if (stop) return { kind: 'ended', why: endedWords(stop), short: `ended${utc(stop.iso)}` };
    if (ended) return { kind: 'ended', why: ended };
    if (replay) return { kind: 'replaying' };
    const last = recording.last();
    const age = last?.wallMs != null && opts.wallMs ? (opts.wallMs() - last.wallMs) / 1000 : null;
    if (last && notBeingWritten((now - grewMs) / 1000, age, last.heartbeat_s)) return { kind: 'not-written', ...notWrittenWords(last) };
    return { kind: 'following' };
  };
  return {
    entries: entries(),
    status(): FeedStatus {
      const now = opts.nowMs();
      if (now - sizeAt >= SIZE_EVERY_MS) {
        const was = size;
        size = opts.sizeOf(opts.path);
        if (sizeAt > -Infinity && size !== was) grewMs = now;
        sizeAt = now;
      }
      return {
        sourceKind: 'watch',
        sourceLabel: resets > 0 ? `${opts.path} (re-read ${resets}×)` : opts.path,
        speed: replay ? opts.speed! : null,
        connection: connection(now),
        journal: size !== null ? { path: opts.path, bytes: size } : null,
        writesJournal: false,
      };
    },
    async close() {
      abort.abort();
    },
  };
}
