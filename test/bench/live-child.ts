// Child process of the live benchmark: replays a simulated run in real time (× speed) into the live store and the
// ink view on a fake terminal, and prints CPU use and arrival → snapshot → frame latencies as JSON.
//   view  the real store + view     pace  only the pacing loop (the baseline: what receiving the lines costs)
import { Writable } from 'node:stream';
import { performance } from 'node:perf_hooks';
import React from 'react';
import { render } from 'ink';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { App } from '../../host/tui/components/app.tsx';
import type { FeedStatus } from '../../host/tui/feed.ts';
import { createLiveStore } from '../../host/tui/live-store.ts';
import { createResultSource } from '../../host/pipeline/result-client.ts';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const [mode, speedS, windowS, preloadS, scenario] = process.argv.slice(2);
const speed = Number(speedS);
const window_s = Number(windowS);
const preload_s = Number(preloadS);
if ((mode !== 'view' && mode !== 'pace') || !(speed > 0) || !(window_s > 0) || !(preload_s >= 0) || !scenario) {
  process.stderr.write('usage: live-child.ts view|pace SPEED WINDOW_S PRELOAD_S SCENARIO\n');
  process.exit(2);
}

const entries: JournalEntry[] = [];
for (const line of simulateJournal(loadScenario(scenario), { seed: 5, durationS: preload_s + window_s * speed + 5 }).lines) entries.push(parseJournalLine(line));
const firstLive = entries.findIndex((e) => (e.kind === 'data' || e.kind === 'annotation') && e.hostUs >= preload_s * 1e6);

const nowMs = (): number => performance.now();
const arrivals: number[] = [];
const snapMs: number[] = [];
const frameMs: number[] = [];
let pendingFrame: number[] = [];
let frames = 0;
let bytes = 0;
let push: (e: JournalEntry) => void = () => undefined;
let stop: () => void = () => undefined;

if (mode === 'view') {
  // The same full-result worker the commands use (host/cli/commands/view-process.ts).
  const store = createLiveStore({ createPipeline: () => createRunPipeline(), createResults: () => createResultSource(), nowMs, timers: { setInterval, clearInterval: (h) => clearInterval(h as NodeJS.Timeout) } });
  // Each arrival waits for the first snapshot that contains it, then for the first frame after that snapshot.
  let waiting: { i: number; t: number }[] = [];
  store.subscribe(() => {
    const snap = store.getSnapshot();
    const t = nowMs();
    const still: { i: number; t: number }[] = [];
    for (const w of waiting) {
      if (w.i < snap.entries) {
        snapMs.push(t - w.t);
        pendingFrame.push(w.t);
      } else still.push(w);
    }
    waiting = still;
  });
  const stdout = Object.assign(
    new Writable({
      write(chunk: Buffer | string, _enc, cb) {
        frames++;
        bytes += chunk.length;
        const t = nowMs();
        for (const a of pendingFrame) frameMs.push(t - a);
        pendingFrame = [];
        cb();
      },
    }),
    { isTTY: true, columns: 120, rows: 36 },
  );
  const status = (): FeedStatus => ({ sourceKind: 'demo', sourceLabel: 'bench', speed, connection: { kind: 'simulated' }, journal: null, writesJournal: false });
  const ink = render(React.createElement(App, { store, status, nowMs, onEffect: () => undefined, interactive: false }), {
    stdout: stdout as unknown as NodeJS.WriteStream,
    patchConsole: false,
    exitOnCtrlC: false,
    maxFps: 10,
  });
  for (let i = 0; i < firstLive; i++) store.push(entries[i]!);
  await store.flush();
  let pushed = firstLive;
  push = (e) => {
    waiting.push({ i: pushed++, t: nowMs() });
    store.push(e);
  };
  stop = () => {
    store.stop();
    ink.unmount();
  };
} else {
  let received = 0;
  push = (e) => {
    if (e.kind === 'data') received++;
  };
  stop = () => {
    if (received < 0) throw new Error('unreachable');
  };
}

// Let the preload's work and the first frames settle before measuring.
await new Promise((r) => setTimeout(r, 500));
const hostUs0 = (entries[firstLive] as { hostUs: number }).hostUs;
const t0 = nowMs();
const cpu0 = process.cpuUsage();
let i = firstLive;
let lines = 0;
await new Promise<void>((resolve) => {
  const next = (): void => {
    const elapsed = nowMs() - t0;
    if (elapsed >= window_s * 1000) return resolve();
    while (i < entries.length) {
      const e = entries[i]!;
      const due = e.kind === 'data' || e.kind === 'annotation' ? (e.hostUs - hostUs0) / 1000 / speed : elapsed;
      if (due > elapsed) break;
      arrivals.push(nowMs());
      push(e);
      lines++;
      i++;
    }
    const e = entries[i];
    const due = e && (e.kind === 'data' || e.kind === 'annotation') ? (e.hostUs - hostUs0) / 1000 / speed : window_s * 1000;
    setTimeout(next, Math.max(0, Math.min(due, window_s * 1000) - (nowMs() - t0)));
  };
  next();
});
const wall = (nowMs() - t0) / 1000;
const cpu = process.cpuUsage(cpu0);
stop();
process.stdout.write(`${JSON.stringify({ mode, speed, lines, wallS: wall, cpuPct: ((cpu.user + cpu.system) / 1e6 / wall) * 100, snapMs, frameMs, frames, bytes, preloadLines: firstLive })}\n`);
process.exit(0);
