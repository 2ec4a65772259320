// The live feed: a board's link journaled as it arrives (the journal never waits for the screen), shown as entries.
import type { JournalEntry } from '../../../protocol/journal.ts';
import type { DeviceLink } from '../../link/device-link.ts';
import type { JournalWriter } from '../../journal/journal-writer.ts';
import { startRecording, type StateEvent } from '../../session/recording-session.ts';
import type { ConnectionState, Feed, FeedStatus } from '../feed.ts';

/** The part of the device link the feed uses. */
export type FeedLink = Pick<DeviceLink, 'ready' | 'onEvent' | 'path' | 'close'>;

export interface DeviceFeedOptions {
  readonly link: FeedLink;
  readonly writer: JournalWriter;
  /** The link's clock: µs since this journal block's `#start`. */
  readonly nowUs: () => number;
  readonly start: Date;
  readonly source: string;
  readonly rigJson?: string;
  readonly portLabel: string;
}

/** The view's words for a state of the link (a closed link ends the feed, with the failure that closed it). */
function connectionOf(e: StateEvent, failure: Error | null): ConnectionState {
  if (e.state === 'reconnecting') return { kind: 'reconnecting', retries: e.attempt };
  if (e.state === 'closed') return { kind: 'ended', why: failure ? failure.message : 'port closed' };
  return { kind: e.state };
}

/** Journals the link's lines and annotations as they arrive; the entries follow for the view. */
export function deviceFeed(opts: DeviceFeedOptions): Feed {
  const { link, writer } = opts;
  const header = { start: opts.start, source: opts.source, ...(opts.rigJson !== undefined ? { rigJson: opts.rigJson } : {}) };
  const queue: JournalEntry[] = [];
  let wake: (() => void) | null = null;
  let connection: ConnectionState = { kind: 'opening' };
  let closed = false;
  let failure: Error | null = null;
  let closing: Promise<void> | null = null;

  const enqueue = (e: JournalEntry): void => {
    queue.push(e);
    wake?.();
  };
  const fail = (e: unknown): void => {
    failure ??= e instanceof Error ? e : new Error(String(e));
    void close();
  };

  // The same recording session as `record`: the block starts at the hello; the view sees what the journal gets.
  const session = startRecording({
    link,
    writer,
    header,
    onEntry: enqueue,
    onState: (e) => {
      connection = connectionOf(e, failure);
      if (e.state !== 'closed') return;
      closed = true;
      wake?.();
    },
    onWriteError: fail,
  });
  // No hello at all: the link gives up with a message that says what to check.
  link.ready.catch(fail);

  async function close(): Promise<void> {
    closing ??= (async () => {
      await link.close();
      writer.close();
    })();
    return closing;
  }

  async function* entries(): AsyncGenerator<JournalEntry> {
    for (;;) {
      while (queue.length > 0) yield queue.shift()!;
      if (closed) break;
      await new Promise<void>((r) => (wake = r));
      wake = null;
    }
    if (failure) throw failure;
  }

  return {
    entries: entries(),
    status: (): FeedStatus => ({
      sourceKind: 'live',
      sourceLabel: link.path() ?? opts.portLabel,
      speed: null,
      connection,
      journal: { path: writer.path, bytes: writer.size() },
      writesJournal: !closed,
    }),
    async note(text) {
      session.note(opts.nowUs(), text);
    },
    close,
  };
}
