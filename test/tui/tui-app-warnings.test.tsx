// The warning line on recorded snapshots: silence, missing heartbeats, a gate off centre, the clock in the budget.
import React from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from 'ink-testing-library';
import { App, ARRIVAL_GRACE_MS } from '../../host/tui/components/app.tsx';
import { warningText } from '../../host/output/warning-words.ts';
import type { StoreSnapshot } from '../../host/tui/live-store.ts';
import type { FeedStatus } from '../../host/tui/feed.ts';
import { demoStatus, fixedStore, frameWhere, loadRecorded } from './snapshots.ts';

afterEach(() => cleanup());

const liveStatus = (over: Partial<FeedStatus> = {}): FeedStatus =>
  demoStatus({ sourceKind: 'live', sourceLabel: '/dev/ttyUSB0', speed: null, connection: { kind: 'connected' }, journal: { path: 'run.journal', bytes: 1 }, writesJournal: true, ...over });

function warningLine(snapshot: StoreSnapshot, status: FeedStatus, wallAfterLastLineMs: number) {
  const r = render(<App store={fixedStore(snapshot)} status={() => status} nowMs={() => (snapshot.lastArrivalMs ?? 0) + wallAfterLastLineMs} onEffect={() => {}} interactive />);
  return frameWhere(r.lastFrame, (f) => f.includes('health')).then((f) => {
    const lines = f.split('\n');
    return lines[lines.findIndex((l) => l.startsWith('health')) + 1]!;
  });
}

describe('warning line', () => {
  it('shows the analysis\' own first warning, in the words analyze prints, and nothing to act on without any', async () => {
    const rec = loadRecorded('snapshot-night-reboot');
    const first = warningText(rec.snapshot.result.warnings[0]!);
    expect(await warningLine(rec.snapshot, liveStatus(), 0)).toContain(first.slice(0, 40));
    const quiet = { ...rec.snapshot, result: { ...rec.snapshot.result, warnings: [] } };
    expect(await warningLine(quiet, liveStatus(), 0)).toContain('nothing to act on');
  });

  it('says g sits on the nominal clock early in the demo (±2887 ppm), as the analysis does', async () => {
    const rec = loadRecorded('snapshot-demo-120s');
    expect(rec.snapshot.result.warnings.map((w) => w.kind)).toContain('clock-nominal');
    const line = await warningLine(rec.snapshot, demoStatus(), 0);
    expect(line).toMatch(/too short \(118 s of heartbeats/);
  });

  it('warns when no line came for three periods and three heartbeats (a stalled board)', async () => {
    const rec = loadRecorded('snapshot-night-reboot');
    // 10 s of silence at real time: > 3 × T0 (2.45 s) and > 3 heartbeats (1 s).
    const line = await warningLine(rec.snapshot, liveStatus(), 10_000 + ARRIVAL_GRACE_MS);
    expect(line).toMatch(/no passes for 1\d s/);
    expect(line).toContain(`+${rec.snapshot.result.warnings.length + 1} more`);
  });

  it('says nothing about silence once a replay has ended', async () => {
    const rec = loadRecorded('snapshot-night-reboot');
    const quiet = { ...rec.snapshot, result: { ...rec.snapshot.result, warnings: [] } };
    expect(await warningLine(quiet, liveStatus({ connection: { kind: 'ended', why: 'end of journal' } }), 60_000)).toContain('nothing to act on');
  });

  it('asks to move a gate that is 3 mm off: the way to move it when the release was recorded, else how to find it', async () => {
    const rec = loadRecorded('snapshot-night-reboot');
    const gate = (side: 'release' | null) => ({ kind: 'gate-offset' as const, offset_m: -0.003, u_m: 0.0001, side });
    const snap = (side: 'release' | null) => ({ ...rec.snapshot, result: { ...rec.snapshot.result, warnings: [gate(side)] } });
    expect(await warningLine(snap('release'), liveStatus(), 0)).toContain('gate 3.0 mm off the lowest point: move it 3.0 mm toward the release side');
    const unknown = await warningLine(snap(null), liveStatus(), 0);
    expect(unknown).toContain('gate 3.0 mm off the lowest point: side not known');
    expect(unknown).not.toMatch(/toward|away/);
  });

  it('shows a reconnecting link with its retry count, and the disconnect first', async () => {
    const rec = loadRecorded('snapshot-night-reboot');
    const st = liveStatus({ connection: { kind: 'reconnecting', retries: 3 } });
    const r = render(<App store={fixedStore(rec.snapshot)} status={() => st} nowMs={() => 0} onEffect={() => {}} interactive />);
    const f = await frameWhere(r.lastFrame, (x) => x.includes('reconnecting'));
    expect(f.split('\n').slice(0, 2).join('\n')).toContain('link reconnecting (try 3)');
    expect(await warningLine(rec.snapshot, st, 0)).toContain('device disconnected');
  });
});
