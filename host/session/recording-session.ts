// One recording session: a device link's events → journal entries, the same for `record` and `live`.
import { journalHeader, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import type { BlockHeader, JournalWriter } from '../journal/journal-writer.ts';
import type { DeviceLink, LinkEvent } from '../link/device-link.ts';

export type StateEvent = Extract<LinkEvent, { type: 'state' }>;

export interface RecordingSessionOptions {
  readonly link: Pick<DeviceLink, 'onEvent'>;
  readonly writer: JournalWriter;
  readonly header: BlockHeader;
  /** Every entry as the journal gets it, the block header first (with its magic line). */
  readonly onEntry?: (e: JournalEntry) => void;
  /** Every state change of the link (opening, waiting for the hello, connected, reconnecting, closed). */
  readonly onState?: (e: StateEvent) => void;
  /** The journal could not be written (disk full, I/O error): recording cannot go on. */
  readonly onWriteError: (e: Error) => void;
}

export interface RecordingSession {
  /** True once the board's hello opened the journal block. */
  started(): boolean;
  /** Appends a `note` annotation (opening the block if the board has not said hello yet). */
  note(hostUs: number, text: string): void;
}

function toEntry(e: LinkEvent): JournalEntry | null {
  if (e.type === 'line') return { kind: 'data', hostUs: e.hostUs, line: e.line };
  if (e.type === 'annotation') return { kind: 'annotation', hostUs: e.hostUs, word: e.word, text: e.text };
  return null;
}

/**
 * Subscribes to the link and journals what it says. The block starts at the board's first hello, so a board
 * that never answers (a wrong baud, another device) leaves no journal. Lines that arrive while no hello has
 * been heard on the open port (a board that kept running while the port opened, bootloader noise) cannot be
 * placed on the device's clock: they are kept as `prehello` annotations, in arrival order, before the
 * connect annotation and the hello, so the analysis never reads device times of an unknown clock.
 */
export function startRecording(o: RecordingSessionOptions): RecordingSession {
  let started = false;
  let failed = false;
  const held: JournalEntry[] = [];

  const write = (e: JournalEntry): void => {
    if (failed) return;
    try {
      if (e.kind === 'data') o.writer.data(e.hostUs, e.line);
      else if (e.kind === 'annotation') o.writer.annotate(e.hostUs, e.word, e.text);
    } catch (err) {
      failed = true;
      o.onWriteError(err as Error);
      return;
    }
    o.onEntry?.(e);
  };
  const begin = (): void => {
    if (started) return;
    started = true;
    try {
      o.writer.startBlock(o.header);
    } catch (err) {
      failed = true;
      o.onWriteError(err as Error);
      return;
    }
    for (const line of journalHeader({ ...o.header, withMagic: true })) o.onEntry?.(parseJournalLine(line));
    for (const e of held) write(e);
    held.length = 0;
  };

  let connected = false;
  o.link.onEvent((e) => {
    if (e.type === 'state') {
      connected = e.state === 'connected';
      o.onState?.(e);
      return;
    }
    let entry = toEntry(e);
    if (!entry) return;
    // The hello that opens the block comes right after its connect annotation.
    // The link writes the connect annotation just before the hello that completes the connection.
    if (entry.kind === 'annotation' && entry.word === 'connect') {
      connected = true;
      begin();
    }
    if (entry.kind === 'data' && !connected) entry = { kind: 'annotation', hostUs: entry.hostUs, word: 'prehello', text: entry.line };
    if (started) write(entry);
    else held.push(entry);
  });

  return {
    started: () => started,
    note(hostUs, text) {
      begin();
      write({ kind: 'annotation', hostUs, word: 'note', text });
    },
  };
}
