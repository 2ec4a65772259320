// The live screen over recorded snapshots: the numbers shown are the snapshot's, and plausible against the simulator's truth.
import React from 'react';
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from 'ink-testing-library';
import { App } from '../../host/tui/components/app.tsx';
import { formatDuration, formatWithU } from '../../host/tui/format.ts';
import { demoStatus, fixedStore, frameWhere, loadRecorded, tick } from './snapshots.ts';

afterEach(() => cleanup());

function show(name: Parameters<typeof loadRecorded>[0], status = demoStatus()) {
  const rec = loadRecorded(name);
  const r = render(<App store={fixedStore(rec.snapshot)} status={() => status} nowMs={() => rec.snapshot.lastArrivalMs ?? 0} onEffect={() => {}} interactive />);
  return { rec, r };
}

/** The first number after `label` on a line of the frame. */
function valueAfter(frame: string, label: string): number {
  const line = frame.split('\n').find((l) => l.startsWith(label));
  const m = line ? /(-?\d+\.\d+)/.exec(line.slice(label.length)) : null;
  return m ? Number(m[1]) : NaN;
}

describe('live screen numbers', () => {
  it('shows T0 and g exactly as formatted from the result, and close to the simulated truth', async () => {
    const { rec, r } = show('snapshot-demo-120s');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('T0'));
    const res = rec.snapshot.result;
    expect(f).toContain(formatWithU(res.T0_s, res.T0_u_s));
    expect(f).toContain(formatWithU(res.g_m_s2, res.g_u_m_s2));
    // Truth: the simulator's T0 and g for this scenario (sim truth file). Plausibility bounds of the issue:
    // period within 1 %, g within a few percent; the analysis' own uncertainty is the sharper test (k = 3).
    const T0 = valueAfter(f, 'T0');
    const g = valueAfter(f, 'g ');
    expect(Math.abs(T0 / rec.truth.T0_s - 1)).toBeLessThan(0.01);
    expect(Math.abs(g / rec.truth.g_m_s2 - 1)).toBeLessThan(0.03);
    expect(Math.abs(res.g_m_s2! - rec.truth.g_m_s2)).toBeLessThan(3 * res.g_u_m_s2!);
  });

  it('shows the last half-periods, period, amplitude and pass count of the live state', async () => {
    const { rec, r } = show('snapshot-demo-120s');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('passes'));
    const live = rec.snapshot.live;
    expect(f).toContain(`${live.halfPeriodsS[0]!.toFixed(5)}  ${live.halfPeriodsS[1]!.toFixed(5)} s`);
    expect(valueAfter(f, 'period')).toBeCloseTo(live.periodS!, 5);
    expect(valueAfter(f, 'amplitude')).toBeCloseTo(live.amplitudeDeg!, 2);
    expect(f).toMatch(new RegExp(`passes\\s+${rec.snapshot.result.passes}\\b`));
  });

  it('shows the gate offset in mm with the way to move it, matching the truth to 0.2 mm', async () => {
    const { rec, r } = show('snapshot-demo-120s');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('gate offset'));
    const mm = valueAfter(f, 'gate offset');
    // Issue 5's bound for the gate offset: within 0.2 mm of the truth.
    expect(Math.abs(mm - rec.truth.gate_offset_m * 1000)).toBeLessThan(0.2);
    // The demo's device boots 0.5 s before the release: too short a quiet (under a half-period) to prove the
    // release was seen, so no side is stated, only how to find it.
    expect(rec.snapshot.result.gate_offset_side).toBeNull();
    expect(f).toContain('side unknown: move 1 mm, re-run');
    expect(f).not.toMatch(/release side/);
  });

  it('counts the faults of the night run: a reboot, line errors and a lost line', async () => {
    const { rec, r } = show('snapshot-night-reboot');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('health'));
    const c = rec.snapshot.live.counts;
    const health = f.split('\n').find((l) => l.startsWith('health'))!;
    expect(health).toContain(`line errors ${c.crc_errors + c.bad_lines}`);
    expect(health).toContain(`lost ${c.lines_lost}`);
    expect(health).toContain(`reboots ${c.reboots}`);
    expect(c.reboots).toBe(1);
  });

  it('names the source, the speed, the firmware and the protocol version in the status lines', async () => {
    const { rec, r } = show('snapshot-demo-120s');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('scenario'));
    const top = f.split('\n').slice(0, 2).join('\n');
    expect(top).toContain('scenario demo-low-q');
    expect(top).toContain('speed ×5');
    expect(top).toContain(`fw ${rec.snapshot.live.hello!.fw} · protocol ${rec.snapshot.live.hello!.proto}`);
    expect(top).toContain('link simulated');
    // Two minutes of heartbeats are too few for a clock fit: the analysis falls back to the nominal rate.
    expect(rec.snapshot.result.clock_source).toBe('nominal');
    expect(top).toContain(`clock nominal (±${rec.snapshot.result.clock_u_ppm!.toFixed(0)} ppm)`);
    expect(top).toContain(`run ${formatDuration(rec.snapshot.lastHost_s!)}`);
    await tick();
  });

  it('draws both plots with axis titles and units', async () => {
    const { r } = show('snapshot-demo-120s');
    const f = await frameWhere(r.lastFrame, (x) => x.includes('time (min)'));
    expect(f).toContain('period T (s)');
    expect(f).toContain('amplitude θ0 (°)');
    expect(f).toContain('time (min)');
    expect(f).toMatch(/[\u2801-\u28ff]/);
  });
});
