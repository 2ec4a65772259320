// What the live view is fed by: a stream of journal entries plus the state of where they come from.
import type { JournalEntry } from '../../protocol/journal.ts';

/** The state of the link or file behind the view. */
export type ConnectionState =
  | { readonly kind: 'simulated' }
  | { readonly kind: 'opening' }
  | { readonly kind: 'waiting-hello'; readonly since_s?: number }
  | { readonly kind: 'connected' }
  | { readonly kind: 'reconnecting'; readonly retries: number }
  | { readonly kind: 'following' }
  | { readonly kind: 'replaying' }
  | { readonly kind: 'ended'; readonly why: string; readonly short?: string }
  /** A followed journal that has stopped growing without the recorder's stop (it may grow again). */
  | { readonly kind: 'not-written'; readonly why: string; readonly short: string };

export interface FeedStatus {
  readonly sourceKind: 'demo' | 'live' | 'watch';
  /** Scenario name, port path or journal path. */
  readonly sourceLabel: string;
  /** Replay or simulation speed (× real time); null for a live board. */
  readonly speed: number | null;
  readonly connection: ConnectionState;
  /** The journal being written (live) or read (watch), with its current size. */
  readonly journal: { readonly path: string; readonly bytes: number } | null;
  /** This process writes the journal: quitting asks first, and notes go into it. */
  readonly writesJournal: boolean;
}

/** A source of entries for the view: the simulator, a board with its journal, or a journal being followed. */
export interface Feed {
  /** Entries in journal order; ends when the source ends (a replay finishes, the run stops). */
  readonly entries: AsyncIterable<JournalEntry>;
  status(): FeedStatus;
  /** Appends a `note` annotation to the journal this process writes. */
  note?(text: string): Promise<void>;
  /** Stops intake, flushes and closes whatever the feed holds (port, journal). Safe to call twice. */
  close(): Promise<void>;
}

/** True while more lines are expected (a finished replay or a stopped run expects none). */
export function expectsLines(c: ConnectionState): boolean {
  return c.kind === 'connected' || c.kind === 'following' || c.kind === 'simulated' || c.kind === 'replaying';
}
