// The plane panel and the room line as data (pure): what a two-beam run with a room sensor shows, and what a fault shows.
import { describe, expect, it } from 'vitest';
import { SENSOR_FAULTS } from '../../protocol/records.ts';
import { airDensityCipm2007 } from '../../host/analysis/air-density.ts';
import type { LiveRoom } from '../../host/pipeline/live-state.ts';
import { plusMinus } from '../../host/output/value-u.ts';
import { buildViewModel, type ViewInput } from '../../host/tui/view-model.ts';
import { TOP_VIEW_PASSES, planeView } from '../../host/tui/view-plane.ts';
import { roomLine } from '../../host/tui/view-room.ts';
import { plainStatusLine } from '../../host/tui/plain-status.ts';
import { demoStatus, loadRecorded } from './snapshots.ts';

function input(name: Parameters<typeof loadRecorded>[0], over: Partial<ViewInput> = {}): ViewInput {
  const s = loadRecorded(name).snapshot;
  return { feed: demoStatus(), live: s.live, result: s.result, rig: s.rig, now_s: s.lastHost_s!, since_s: 0, heartbeatInterval_s: 1, restartedAt_s: null, paused: false, ...over };
}
const rowOf = (rows: readonly { label: string; value: string }[], label: string): string | undefined => rows.find((r) => r.label === label)?.value;

describe('plane panel (view model)', () => {
  it('shows the latest pass and the full result’s turning rate, and draws the newest passes’ ellipses', () => {
    const i = input('snapshot-plane-room');
    const vm = buildViewModel(i);
    const pl = i.live.plane!;
    const n = pl.t_s.length;
    expect(n).toBeGreaterThan(TOP_VIEW_PASSES);
    expect(rowOf(vm.plane!.rows, 'azimuth')).toBe(`${pl.azimuth_deg[n - 1]! >= 0 ? '+' : ''}${pl.azimuth_deg[n - 1]!.toFixed(1)}°`);
    const s = i.result.plane!;
    expect(rowOf(vm.plane!.rows, 'turn°/h')).toBe(plusMinus(s.precession_deg_per_h, s.precession_u_deg_per_h));
    expect(vm.plane!.paths).toHaveLength(TOP_VIEW_PASSES);
    expect(vm.plane!.paths.at(-1)).toEqual({ azimuth_rad: (pl.azimuth_deg[n - 1]! * Math.PI) / 180, a_m: pl.semi_major_m[n - 1]!, b_m: pl.minor_axis_m[n - 1]! });
    // The rig's beams at ±45°: their lines (square to the normals) at 135° and 45°.
    expect(vm.plane!.beamLines_rad.map((r) => (r * 180) / Math.PI)).toEqual([135, 45]);
  });

  it('is plausible against the simulated truth: a 12° release on 1 m (a ≈ 2 sin 6° m), a narrow counterclockwise ellipse', () => {
    const i = input('snapshot-plane-room');
    const v = planeView(i.live.plane, i.result, i.rig)!;
    // plane-turns-40deg: 1.0 m, released at 12°, Q 6000, after 20 min: the amplitude decays by e^(−πt/(Q·T)) ≈ 0.73.
    const a = v.paths.at(-1)!.a_m;
    expect(a).toBeGreaterThan(2 * Math.sin((6 * Math.PI) / 180) * 0.65);
    expect(a).toBeLessThan(2 * Math.sin((6 * Math.PI) / 180));
    expect(v.halfSpan_m).toBeCloseTo(1.1 * Math.max(...v.paths.map((p) => p.a_m)), 12);
    // A transverse push of +5.6 mm/s: b = v/ω0 ≈ 0.0056/3.13 ≈ +1.8 mm at release, shrinking with the swing.
    const b = v.paths.at(-1)!.b_m;
    expect(b).toBeGreaterThan(0.0008);
    expect(b).toBeLessThan(0.0018);
    expect(rowOf(v.rows, 'minor')).toBe(`+${(b * 1000).toFixed(1)} mm ↺`);
  });

  it('says ↻ for a clockwise path, waits for the rate, and is absent for one beam', () => {
    const i = input('snapshot-plane-room');
    const pl = i.live.plane!;
    const flipped = { ...pl, minor_axis_m: pl.minor_axis_m.map((b) => -b) };
    const v = planeView(flipped, { ...i.result, plane: null }, i.rig)!;
    expect(rowOf(v.rows, 'minor')).toMatch(/^-\d+\.\d mm ↻$/);
    expect(rowOf(v.rows, 'turn°/h')).toBe('—');
    // A minor axis that rounds to 0.0 mm has no sense to show.
    expect(rowOf(planeView({ ...pl, minor_axis_m: pl.minor_axis_m.map(() => 3e-5) }, i.result, i.rig)!.rows, 'minor')).toBe('0.0 mm');
    expect(buildViewModel(input('snapshot-demo-120s')).plane).toBeNull();
  });
});

describe('room line (view model)', () => {
  const reading = (over: Partial<NonNullable<LiveRoom['reading']>> = {}): NonNullable<LiveRoom['reading']> => {
    const c = { tempC: 20, pressPa: 101325, rhPct: 50 };
    return { ...c, airDensity_kg_m3: airDensityCipm2007(c), host_s: 100, ...over };
  };

  it('the reading as sent, the CIPM-2007 air density and its age', () => {
    const line = roomLine({ sensorState: 0, reading: reading(), spacing_s: null }, 172.4)!;
    // 20 °C, 101325 Pa, 50 %RH: 1.19931 kg/m³ (docs/references.md#ref-air-density), shown to three decimals.
    expect(line.items).toEqual([
      { label: 'room', value: '20.00 °C · 1013.25 hPa · 50.0 %RH' },
      { label: 'air', value: '1.199 kg/m³' },
      { label: 'read', value: '1:12 ago' },
    ]);
    expect(line.tone).toBe('normal');
  });

  it('the recorded two-beam run: the last reading of the simulated room (21 °C ± 2 K, 1013.25 hPa, 45 ± 5 %RH)', () => {
    const i = input('snapshot-plane-room');
    const r = i.live.room!.reading!;
    expect(i.live.room!.sensorState).toBe(0);
    expect(Math.abs(r.tempC - 21)).toBeLessThanOrEqual(2);
    expect(Math.abs(r.pressPa - 101325)).toBeLessThan(1000);
    expect(Math.abs(r.rhPct - 45)).toBeLessThanOrEqual(5);
    expect(r.airDensity_kg_m3).toBe(airDensityCipm2007(r));
    // Readings every 10 s of the simulated room: the last one is under 10 s old.
    const vm = buildViewModel(i);
    expect(vm.room!.items.find((x) => x.label === 'read')!.value).toMatch(/^0:0\d ago$/);
    expect(vm.room!.items[1]).toEqual({ label: 'air', value: `${r.airDensity_kg_m3.toFixed(3)} kg/m³` });
  });

  it('a faulted sensor: its fault first, then only the last temperature and its age', () => {
    const absent = roomLine({ sensorState: SENSOR_FAULTS.absent, reading: reading(), spacing_s: null }, 700)!;
    expect(absent.items).toEqual([
      { label: 'sensor', value: 'not answering (retrying)' },
      { label: 'last', value: '20.00 °C' },
      { label: 'read', value: '10:00 ago' },
    ]);
    expect(absent.tone).toBe('bad');
    const two = roomLine({ sensorState: SENSOR_FAULTS.bus | SENSOR_FAULTS.chip, reading: null, spacing_s: null }, 0)!;
    expect(two.items).toEqual([{ label: 'sensor', value: 'bus fault, wrong chip (retrying)' }]);
    const off = roomLine({ sensorState: SENSOR_FAULTS.off, reading: null, spacing_s: null }, 0)!;
    expect(off).toEqual({ items: [{ label: 'sensor', value: 'readings off' }], tone: 'muted' });
  });

  it('a reading overdue by the warnings\' rule is shown in the warning tone, the rest of the line unchanged', () => {
    const fresh = roomLine({ sensorState: 0, reading: reading(), spacing_s: 10 }, 125)!;
    const stale = roomLine({ sensorState: 0, reading: reading(), spacing_s: 10 }, 135, true)!;
    expect(fresh.tone).toBe('normal');
    expect(stale.tone).toBe('bad');
    expect(stale.items.map((x) => x.label)).toEqual(['room', 'air', 'read']);
    expect(stale.items[2]).toEqual({ label: 'read', value: '0:35 ago' });
  });

  it('the recorded two-beam run: its readings come every 10 s, so its room line is not stale at the snapshot', () => {
    const i = input('snapshot-plane-room');
    const vm = buildViewModel(i);
    expect(vm.room!.tone).toBe('normal');
    expect(vm.warnings.map((w) => w.kind)).not.toContain('room-reading-stale');
    // The same run with its last reading 40 s old (three 10 s intervals and more) and the heartbeats still coming.
    const room = i.live.room!;
    const late = buildViewModel({ ...i, live: { ...i.live, room: { ...room, reading: { ...room.reading!, host_s: room.reading!.host_s - 40 } } } });
    expect(late.room!.tone).toBe('bad');
    expect(late.warnings.map((w) => w.kind)).toContain('room-reading-stale');
  });

  it('a sensor that has not read yet, and no line at all without a sensor', () => {
    expect(roomLine({ sensorState: 0, reading: null, spacing_s: null }, 0)).toEqual({ items: [{ label: 'room', value: 'sensor ready, first reading to come' }], tone: 'muted' });
    expect(roomLine(null, 0)).toBeNull();
    expect(buildViewModel(input('snapshot-night-reboot')).room).toBeNull();
  });
});

describe('plain status line (no terminal)', () => {
  it('adds the axis, its turning rate and the room to the line of a two-beam run with a sensor, nothing to a one-beam run', () => {
    const i = input('snapshot-plane-room');
    const line = plainStatusLine(buildViewModel(i));
    const pl = i.live.plane!;
    const s = i.result.plane!;
    expect(line).toContain(`azimuth=+${pl.azimuth_deg.at(-1)!.toFixed(1)}°`);
    expect(line).toContain(`turn=${plusMinus(s.precession_deg_per_h, s.precession_u_deg_per_h).replace(' ± ', '±')} °/h`);
    expect(line).toMatch(/minor=\+\d\.\d mm ↺/);
    expect(line).toContain(`air ${i.live.room!.reading!.airDensity_kg_m3.toFixed(3)} kg/m³`);
    const one = plainStatusLine(buildViewModel(input('snapshot-demo-120s')));
    expect(one).not.toMatch(/azimuth=|room=/);
  });
});
