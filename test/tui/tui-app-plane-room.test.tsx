// The live screen of a two-beam run with a room sensor: the plane panel and the room line as drawn, from a recorded snapshot.
import React from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from 'ink-testing-library';
import { App } from '../../host/tui/components/app.tsx';
import { plusMinus } from '../../host/output/value-u.ts';
import { demoStatus, fixedStore, frameWhere, loadRecorded, tick } from './snapshots.ts';

afterEach(() => cleanup());

function show(name: Parameters<typeof loadRecorded>[0]) {
  const rec = loadRecorded(name);
  const r = render(<App store={fixedStore(rec.snapshot)} status={() => demoStatus({ sourceLabel: rec.scenario })} nowMs={() => rec.snapshot.lastArrivalMs ?? 0} onEffect={() => {}} interactive />);
  return { rec, r };
}

const plain = (f: string): string[] => f.replace(/\x1b\[[0-9;]*m/g, '').split('\n');

describe('plane panel and room line on screen', () => {
  it('draws the top view box beside the axis, the turning rate with its u, and the minor axis', async () => {
    const { rec, r } = show('snapshot-plane-room');
    const lines = plain(await frameWhere(r.lastFrame, (x) => x.includes('azimuth')));
    const pl = rec.snapshot.live.plane!;
    const s = rec.snapshot.result.plane!;
    const top = lines.findIndex((l) => l.startsWith('┌────────┐'));
    expect(top).toBeGreaterThan(0);
    // Four lines of braille inside the box, the figures to its right.
    const inside = lines.slice(top + 1, top + 5);
    for (const l of inside) expect(l).toMatch(/^│[\u2800-\u28ff ]{8}│/);
    expect(inside.join('')).toMatch(/[\u2801-\u28ff]/);
    expect(lines[top + 5]).toMatch(/^└────────┘/);
    const f = lines.join('\n');
    expect(f).toContain(`azimuth +${pl.azimuth_deg.at(-1)!.toFixed(1)}°`);
    expect(f).toContain(`turn°/h ${plusMinus(s.precession_deg_per_h, s.precession_u_deg_per_h)}`);
    expect(f).toContain(`minor   +${(pl.minor_axis_m.at(-1)! * 1000).toFixed(1)} mm ↺`);
  });

  it('a steady Foucault turning known to 1e-3 °/h still fits whole beside the top view at 80 columns', async () => {
    // The figures of a 10 min watch of plane-foucault-50n with a room: −11.47737 ± 0.00086 °/h.
    const rec = loadRecorded('snapshot-plane-room');
    const snapshot = { ...rec.snapshot, result: { ...rec.snapshot.result, plane: { ...rec.snapshot.result.plane!, precession_deg_per_h: -11.477371, precession_u_deg_per_h: 0.000861 } } };
    const r = render(<App store={fixedStore(snapshot)} status={() => demoStatus()} nowMs={() => 0} onEffect={() => {}} interactive={false} />);
    const f = await frameWhere(r.lastFrame, (x) => x.includes('turn°/h'));
    expect(f).toContain('turn°/h -11.47737 ± 0.00086');
  });

  it('shows the room line above the health line', async () => {
    const { rec, r } = show('snapshot-plane-room');
    const lines = plain(await frameWhere(r.lastFrame, (x) => x.includes('room ')));
    const at = lines.findIndex((l) => l.startsWith('room '));
    expect(lines[at + 1]).toMatch(/^health /);
    const rd = rec.snapshot.live.room!.reading!;
    expect(lines[at]).toContain(`room ${rd.tempC.toFixed(2)} °C · ${(rd.pressPa / 100).toFixed(2)} hPa · ${rd.rhPct.toFixed(1)} %RH · air ${rd.airDensity_kg_m3.toFixed(3)} kg/m³ · read 0:0`);
  });

  it('a one-beam run without a room sensor shows neither, nor their terms in the help', async () => {
    for (const [name, shown] of [
      ['snapshot-demo-120s', false],
      ['snapshot-plane-room', true],
    ] as const) {
      const { r } = show(name);
      const f = await frameWhere(r.lastFrame, (x) => x.includes('passes'));
      expect(f.includes('azimuth'), name).toBe(shown);
      expect(f.includes('┌'), name).toBe(shown);
      expect(plain(f).some((l) => l.startsWith('room ')), name).toBe(shown);
      await tick();
      r.stdin.write('?');
      const help = plain(await frameWhere(r.lastFrame, (x) => x.includes('terms')));
      expect(help.some((l) => l.startsWith('  top view')), name).toBe(shown);
      expect(help.some((l) => l.startsWith('  room ')), name).toBe(shown);
      r.unmount();
    }
  });
});
