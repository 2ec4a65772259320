// The live view's shell: feeds the store from a feed, shows ink on a terminal or plain lines elsewhere, and shuts down one way.
import React from 'react';
import { render } from 'ink';
import type { JournalEntry } from '../../protocol/journal.ts';
import { createLiveStore, type LiveStore, type PipelineLike, type StoreSnapshot, type Timers } from './live-store.ts';
import type { ResultSource } from '../pipeline/result-client.ts';
import type { Feed, FeedStatus } from './feed.ts';
import type { KeyEffect } from './keys.ts';
import { App, estimateNow } from './components/app.tsx';
import { buildViewModel, type ViewModel } from './view-model.ts';
import { plainStatusLine } from './plain-status.ts';

type Stream = NodeJS.WritableStream & { isTTY?: boolean; columns?: number; rows?: number };

export interface RunViewOptions {
  readonly feed: Feed;
  readonly createPipeline: () => PipelineLike;
  /** The full result off the main thread (see LiveStoreOptions.createResults); in-thread without it. */
  readonly createResults?: (warn: (line: string) => void) => ResultSource;
  readonly stdout: Stream;
  readonly stderr: Stream;
  readonly stdin: NodeJS.ReadableStream & { isTTY?: boolean };
  /** Wall clock, ms (monotonic). */
  readonly nowMs: () => number;
  readonly timers: Timers & { setTimeout(fn: () => void, ms: number): unknown; clearTimeout(handle: unknown): void };
  /** Subscribes to SIGINT/SIGTERM/SIGHUP; returns an unsubscribe. */
  readonly onSignal: (handler: (signal: string) => void) => () => void;
  /** Seconds between plain status lines without a terminal. */
  readonly plainEvery_s?: number;
  /** Longest wait for the feed to close on shutdown (ms) before giving up on it. */
  readonly closeTimeoutMs?: number;
}

/** Entries for the view come from the feed; pushing them must never stall the render loop for long. */
async function pump(entries: AsyncIterable<JournalEntry>, push: (e: JournalEntry) => void, yieldEvery = 2000): Promise<void> {
  let n = 0;
  for await (const e of entries) {
    push(e);
    // A fast replay hands over entries without waiting; let timers (render, keys) run now and then.
    if (++n % yieldEvery === 0) await new Promise((r) => setTimeout(r, 0));
  }
}

/** The screen's data now, from a store snapshot and the feed's status. */
function viewModelNow(snap: StoreSnapshot, feed: FeedStatus, nowMs: number): ViewModel {
  return buildViewModel({
    feed,
    live: snap.live,
    result: snap.result,
    rig: snap.rig,
    now_s: estimateNow(snap, feed, nowMs),
    since_s: snap.firstHost_s ?? 0,
    heartbeatInterval_s: snap.heartbeatInterval_s,
    restartedAt_s: snap.restartedAt_s,
    paused: false,
  });
}

/** Renders the ink view on the terminal; returns how to take it down. */
function mountInk(opts: RunViewOptions, store: LiveStore, status: () => FeedStatus, onEffect: (e: KeyEffect) => void): () => void {
  const ink = render(<App store={store} status={status} nowMs={opts.nowMs} onEffect={onEffect} interactive />, {
    stdout: opts.stdout as NodeJS.WriteStream,
    stderr: opts.stderr as NodeJS.WriteStream,
    stdin: opts.stdin as NodeJS.ReadStream,
    exitOnCtrlC: false,
    patchConsole: false,
    maxFps: 10,
  });
  return () => ink.unmount();
}

/** What the run has learnt so far: how the feed ended (if it did), and the first failure to report. */
interface RunState {
  ended: FeedStatus['connection'] | null;
  failure: unknown;
}

/** The screen parts to take down at shutdown (set once they are up). */
interface Screen {
  unmount: (() => void) | null;
  plainTimer: unknown;
}

/**
 * The one way down: stop intake and flush the journal (at most `closeTimeoutMs`), then stop the store, then take
 * the screen down; `done` resolves to the exit code.
 */
function shutdownSequence(opts: RunViewOptions, store: LiveStore, state: RunState, screen: Screen) {
  let finish!: (code: number) => void;
  const done = new Promise<number>((r) => (finish = r));
  let shuttingDown = false;
  const shutdown = async (code: number): Promise<void> => {
    if (shuttingDown) return;
    shuttingDown = true;
    const closing = opts.feed.close().catch((e: unknown) => {
      state.failure ??= e;
    });
    let hard: unknown = null;
    await Promise.race([closing, new Promise<void>((r) => (hard = opts.timers.setTimeout(r, opts.closeTimeoutMs ?? 5000)))]);
    opts.timers.clearTimeout(hard);
    store.stop();
    if (screen.plainTimer !== null) opts.timers.clearInterval(screen.plainTimer);
    screen.unmount?.();
    finish(code);
  };
  return { shutdown, done };
}

/** Feeds the store until the feed ends: then the screen shows the final result (and, without a terminal, the run ends). */
function pumpFeed(opts: RunViewOptions, store: LiveStore, state: RunState, interactive: boolean, shutdown: (code: number) => Promise<void>): void {
  void pump(opts.feed.entries, (e) => store.push(e)).then(
    async () => {
      state.ended = { kind: 'ended', why: 'end of input' };
      await store.flush();
      if (!interactive) void shutdown(0);
    },
    async (e: unknown) => {
      state.failure = e;
      state.ended = { kind: 'ended', why: (e as Error).message ?? 'failed' };
      await store.flush();
      // A failed source (no hello, a full disk) ends the view with its message rather than a frozen screen.
      void shutdown(1);
    },
  );
}

/** Runs the view until the user quits, a signal arrives, or (without a terminal) the feed ends; resolves to the exit code. */
export async function runLiveView(opts: RunViewOptions): Promise<number> {
  const warn = (line: string): void => void opts.stderr.write(`halfswing: ${line}\n`);
  const store = createLiveStore({
    createPipeline: opts.createPipeline,
    nowMs: opts.nowMs,
    timers: opts.timers,
    warn,
    ...(opts.createResults ? { createResults: () => opts.createResults!(warn) } : {}),
  });
  const interactive = Boolean(opts.stdout.isTTY && opts.stdin.isTTY);
  const state: RunState = { ended: null, failure: null };
  const screen: Screen = { unmount: null, plainTimer: null };
  const status = (): FeedStatus => {
    const s = opts.feed.status();
    return state.ended && s.connection.kind !== 'ended' ? { ...s, connection: state.ended } : s;
  };
  const { shutdown, done } = shutdownSequence(opts, store, state, screen);
  const offSignal = opts.onSignal(() => void shutdown(0));
  const onEffect = (e: KeyEffect): void => {
    if (e.kind === 'quit') void shutdown(0);
    else if (e.kind === 'restart') store.restart();
    else if (e.kind === 'note') opts.feed.note?.(e.text).catch((err: unknown) => opts.stderr.write(`halfswing: note not written: ${(err as Error).message}\n`));
  };
  pumpFeed(opts, store, state, interactive, shutdown);

  // A reader that goes away (`halfswing demo | head`) is the end of the run, not a crash.
  let outputGone = false;
  const onOutputError = (e: NodeJS.ErrnoException): void => {
    outputGone = true;
    if (e.code !== 'EPIPE') state.failure ??= e;
    void shutdown(e.code === 'EPIPE' ? 0 : 1);
  };
  opts.stdout.on?.('error', onOutputError);
  const writePlain = (): void => {
    if (!outputGone) opts.stdout.write(`${plainStatusLine(viewModelNow(store.getSnapshot(), status(), opts.nowMs()))}\n`);
  };
  if (interactive) screen.unmount = mountInk(opts, store, status, onEffect);
  else screen.plainTimer = opts.timers.setInterval(() => writePlain(), (opts.plainEvery_s ?? 5) * 1000);

  const code = await done;
  offSignal();
  if (!interactive) writePlain();
  opts.stdout.off?.('error', onOutputError);
  if (state.failure) throw state.failure;
  return code;
}
