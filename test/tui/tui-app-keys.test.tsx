// Keys on the live screen: quit (with a question while journaling), notes, pause, restart, help.
import React from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from 'ink-testing-library';
import { App } from '../../host/tui/components/app.tsx';
import type { KeyEffect } from '../../host/tui/keys.ts';
import { demoStatus, fixedStore, frameWhere, loadRecorded, tick } from './snapshots.ts';

afterEach(() => cleanup());

function mount(writesJournal: boolean) {
  const rec = loadRecorded('snapshot-demo-120s');
  const effects: KeyEffect[] = [];
  const store = fixedStore(rec.snapshot);
  const status = demoStatus(writesJournal ? { sourceKind: 'live', sourceLabel: '/dev/ttyUSB0', speed: null, connection: { kind: 'connected' }, journal: { path: 'run.journal', bytes: 1234 }, writesJournal } : {});
  const r = render(<App store={store} status={() => status} nowMs={() => rec.snapshot.lastArrivalMs ?? 0} onEffect={(e) => effects.push(e)} interactive />);
  return { r, effects, store };
}

/** Types keys one at a time with a macrotask after each (the listener attaches after the first render). */
async function type(r: ReturnType<typeof render>, ...keys: string[]): Promise<void> {
  await tick();
  for (const k of keys) {
    r.stdin.write(k);
    await tick();
  }
}

describe('live screen keys', () => {
  it('q quits at once when nothing is being recorded', async () => {
    const { r, effects } = mount(false);
    await type(r, 'q');
    expect(effects).toEqual([{ kind: 'quit' }]);
  });

  it('q asks first while this process writes a journal; y quits, another key stays', async () => {
    const { r, effects } = mount(true);
    await type(r, 'q');
    expect(await frameWhere(r.lastFrame, (f) => f.includes('quit?'))).toContain('Press y to quit');
    expect(effects).toEqual([]);
    await type(r, 'x');
    expect(await frameWhere(r.lastFrame, (f) => !f.includes('quit?'))).toContain('still recording');
    await type(r, 'q', 'y');
    expect(effects).toEqual([{ kind: 'quit' }]);
  });

  it('Ctrl+C quits even while journaling (the shutdown path flushes the journal)', async () => {
    const { r, effects } = mount(true);
    await type(r, '\x03');
    expect(effects).toEqual([{ kind: 'quit' }]);
  });

  it('n opens a note line; typed text and Enter hand the note over', async () => {
    const { r, effects } = mount(true);
    await type(r, 'n');
    expect(await frameWhere(r.lastFrame, (f) => f.includes(' note '))).toContain('Enter adds it to the journal');
    await type(r, 'r', 'e', 'l', 'e', 'a', 's', 'e', 'd', ' ', 'q');
    expect(effects).toEqual([]);
    await type(r, '\r');
    expect(effects).toEqual([{ kind: 'note', text: 'released q' }]);
    expect(await frameWhere(r.lastFrame, (f) => f.includes('note added'))).toContain('note added');
  });

  it('a note pasted with its Enter in one chunk is taken whole', async () => {
    const { r, effects } = mount(true);
    await type(r, 'n', 'moved the gate 1 mm\r');
    expect(effects).toEqual([{ kind: 'note', text: 'moved the gate 1 mm' }]);
  });

  it('p pauses the display and says so; p again resumes', async () => {
    const { r } = mount(false);
    await type(r, 'p');
    expect(await frameWhere(r.lastFrame, (f) => f.includes('display paused'))).toContain('halfswing demo · display paused');
    await type(r, 'p');
    expect(await frameWhere(r.lastFrame, (f) => f.includes('display resumed'))).not.toContain('· display paused');
  });

  it('r asks for the estimates to restart', async () => {
    const { r, effects } = mount(false);
    await type(r, 'r');
    expect(effects).toEqual([{ kind: 'restart' }]);
  });

  it('? shows the help with every key; any key closes it', async () => {
    const { r } = mount(false);
    await type(r, '?');
    const help = await frameWhere(r.lastFrame, (f) => f.includes('terms'));
    for (const k of ['q', 'n', 'p', 'r', '?']) expect(help.split('\n').some((l) => l.startsWith(`  ${k}  `))).toBe(true);
    await type(r, ' ');
    expect(await frameWhere(r.lastFrame, (f) => !f.includes('terms'))).toContain('half-periods');
  });

  it('shows the keys in the footer', async () => {
    const { r } = mount(false);
    const f = await frameWhere(r.lastFrame, (x) => x.includes('help'));
    const footer = f.split('\n').at(-1)!;
    for (const w of ['q  quit', 'n  note', 'p  pause', 'r  restart', '?  help']) expect(footer).toContain(w);
  });
});
