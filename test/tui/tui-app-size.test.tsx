// The frame fits a standard 80×24 terminal (one line to spare, so ink never clears the scrollback) and grows with a bigger one.
import React from 'react';
import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import { render } from 'ink';
import { App } from '../../host/tui/components/app.tsx';
import { demoStatus, fixedStore, loadRecorded, tick } from './snapshots.ts';
import { formatDuration } from '../../host/tui/format.ts';

/** A fake terminal of a given size that keeps the last frame written. */
class FakeTerminal extends EventEmitter {
  last = '';
  constructor(
    public columns: number,
    public rows: number,
  ) {
    super();
  }
  write = (s: string): boolean => {
    this.last = s;
    return true;
  };
}

async function frameAt(columns: number, rows: number, resizeTo?: [number, number], fixture: Parameters<typeof loadRecorded>[0] = 'snapshot-night-reboot', status = demoStatus()): Promise<string[]> {
  const rec = loadRecorded(fixture);
  const out = new FakeTerminal(columns, rows);
  const inst = render(<App store={fixedStore(rec.snapshot)} status={() => status} nowMs={() => 0} onEffect={() => {}} interactive={false} />, {
    stdout: out as unknown as NodeJS.WriteStream,
    debug: true,
    patchConsole: false,
  });
  await tick(50);
  if (resizeTo) {
    [out.columns, out.rows] = resizeTo;
    out.emit('resize');
    await tick(50);
  }
  // Read before unmounting: in CI mode ink writes a bare last frame of its own on unmount.
  const frame = out.last;
  inst.unmount();
  // Colour codes take no columns.
  return frame.replace(/\x1b\[[0-9;]*m/g, '').replace(/\n$/, '').split('\n');
}

const cols = (s: string): number => [...s].length;

describe('frame size', () => {
  it('fits 80×24 with a line to spare', async () => {
    const lines = await frameAt(80, 24);
    expect(lines.length).toBeLessThanOrEqual(23);
    expect(lines.length).toBeGreaterThanOrEqual(20);
    for (const l of lines) expect(cols(l)).toBeLessThanOrEqual(80);
  });

  it('fits 80×24 with the plane panel and the room line, the two extras of a two-beam run with a room sensor', async () => {
    for (const size of [
      [80, 24],
      [140, 40],
    ] as const) {
      const lines = await frameAt(size[0], size[1], undefined, 'snapshot-plane-room');
      expect(lines.length).toBeLessThanOrEqual(size[1] - 1);
      for (const l of lines) expect(cols(l)).toBeLessThanOrEqual(size[0]);
      // Every part is still there: both charts' x axes, the whole top view box, the room line and the keys.
      const f = lines.join('\n');
      for (const part of ['amplitude θ0 (°)', 'time (min)', 'azimuth', 'box', 'room ', 'health', 'q  quit']) expect(f, `${size}: ${part}`).toContain(part);
      expect(lines.filter((l) => l.startsWith('┌') || l.startsWith('└─')).length).toBeGreaterThanOrEqual(2);
    }
  });

  it('a watched journal that is not being written: at 80×24 the status line keeps that, and the run time stopped at its last line', async () => {
    const status = demoStatus({
      sourceKind: 'watch',
      sourceLabel: 'run.journal',
      speed: null,
      journal: { path: 'run.journal', bytes: 123_456 },
      connection: { kind: 'not-written', why: 'not being written since 2026-01-05 09:03:20 UTC', short: 'not written since 2026-01-05 09:03:20 UTC' },
    });
    const rec = loadRecorded('snapshot-demo-120s');
    const lines = await frameAt(80, 24, undefined, 'snapshot-demo-120s', status);
    for (const l of lines) expect(cols(l)).toBeLessThanOrEqual(80);
    expect(lines[1]).toContain('mode not written since 2026-01-05 09:03:20 UTC');
    expect(lines[1]).toContain(`run ${formatDuration(rec.snapshot.lastHost_s!)}`);
  });

  it('uses a larger terminal: wider plots and taller charts', async () => {
    const small = await frameAt(80, 24);
    const big = await frameAt(140, 40);
    expect(big.length).toBeGreaterThan(small.length + 10);
    expect(big.length).toBeLessThanOrEqual(39);
    expect(Math.max(...big.map(cols))).toBeGreaterThan(120);
    for (const l of big) expect(cols(l)).toBeLessThanOrEqual(140);
  });
});

// #14: a 40×12 terminal got the 80-column frame, which wrapped into an unreadable screen with no message.
describe('a terminal smaller than 80×24', () => {
  it('shows one line that says so and names the size needed, within the width', async () => {
    for (const [c, r] of [
      [40, 12],
      [79, 40],
      [120, 23],
      [20, 5],
    ] as const) {
      const lines = await frameAt(c, r);
      expect(lines).toHaveLength(1);
      expect(cols(lines[0]!)).toBeLessThanOrEqual(c);
      expect(lines[0]).toContain('80×24');
    }
    expect((await frameAt(40, 12))[0]).toBe('terminal 40×12 too small: needs 80×24');
    expect((await frameAt(100, 12))[0]).toBe('terminal 100×12 is too small: the live view needs at least 80×24 (enlarge it, or q to quit)');
  });

  it('draws the frame again when the terminal grows, and the line when it shrinks', async () => {
    const grown = await frameAt(40, 12, [80, 24]);
    expect(grown.length).toBeGreaterThanOrEqual(20);
    expect(grown.join('\n')).not.toContain('too small');
    const shrunk = await frameAt(80, 24, [60, 20]);
    expect(shrunk).toEqual(['terminal 60×20 too small: needs 80×24']);
  });
});
