// The view model: which rows, labels and hints the screen gets from a snapshot (pure).
import { describe, expect, it } from 'vitest';
import { buildViewModel, decayCurve, expectedPeriod, type ViewInput } from '../../host/tui/view-model.ts';
import { plainStatusLine } from '../../host/tui/plain-status.ts';
import { lossRate } from '../../host/analysis/damping.ts';
import { periodRatio } from '../../host/analysis/elliptic.ts';
import { demoStatus, loadRecorded } from './snapshots.ts';

function input(over: Partial<ViewInput> = {}): ViewInput {
  const s = loadRecorded('snapshot-night-reboot').snapshot;
  return { feed: demoStatus(), live: s.live, result: s.result, rig: s.rig, now_s: s.lastHost_s!, since_s: 0, heartbeatInterval_s: 1, restartedAt_s: null, paused: false, ...over };
}
const row = (vm: ReturnType<typeof buildViewModel>, label: string) => vm.numbers.find((r) => r.label === label);

describe('view model', () => {
  it('adds the expected local g and the difference in σ when the rig gives latitude and elevation', () => {
    const base = input();
    expect(row(buildViewModel(base), 'local g')).toBeUndefined();
    const vm = buildViewModel(input({ result: { ...base.result, expected_g_m_s2: 9.80812, g_diff_sigma: -0.71 } }));
    expect(row(vm, 'local g')).toMatchObject({ value: '9.8081', unit: 'm/s²', note: '-0.7σ', tone: 'normal' });
    const far = buildViewModel(input({ result: { ...base.result, expected_g_m_s2: 9.7, g_diff_sigma: 15.2 } }));
    expect(row(far, 'local g')).toMatchObject({ note: '+15.2σ', tone: 'bad' });
  });

  it('puts the exact-law curve through T0 and the measured periods on the period plot', () => {
    const vm = buildViewModel(input());
    const T0 = input().result.T0_s!;
    vm.periodCurve.xs.forEach((a, i) => expect(vm.periodCurve.ys[i]).toBeCloseTo(T0 * periodRatio((a * Math.PI) / 180), 12));
    expect(vm.periodCurve.ys[0]).toBeCloseTo(T0, 12);
    expect(vm.periodPoints.xs.length).toBe(input().result.plots.periodVsAmplitude.amplitude_deg.length);
  });

  it('draws the decay of the chosen damping fit, in minutes', () => {
    const vm = buildViewModel(input());
    const r = input().result;
    const fit = r.damping_fits.find((d) => d.model === r.damping_model)!;
    expect(vm.amplitudeCurve.xs[0]).toBeCloseTo(r.plots.amplitudeVsTime.t_s[0]! / 60, 9);
    expect(vm.amplitudeCurve.ys[0]).toBeCloseTo(r.plots.amplitudeVsTime.amplitude_deg[0]!, 9);
    // Falling at the rate the fit gives: a central difference on the curve's grid against the rate at the midpoint.
    const [y0, y1] = [vm.amplitudeCurve.ys[0]!, vm.amplitudeCurve.ys[1]!].map((d) => (d * Math.PI) / 180) as [number, number];
    const dt = (vm.amplitudeCurve.xs[1]! - vm.amplitudeCurve.xs[0]!) * 60;
    expect((y1 - y0) / dt / -lossRate(fit, (y0 + y1) / 2)).toBeCloseTo(1, 2);
  });

  it('integrates an exponential decay exactly enough: A = A0·e^(−t/τ) for a pure viscous fit', () => {
    const c = decayCurve({ a0: 0, a1: 1 / 600, a2: 0 }, 0, 20, 1200, 120);
    expect(c.ys.at(-1)! / (20 * Math.exp(-2))).toBeCloseTo(1, 8);
    expect(c.xs.at(-1)).toBeCloseTo(20, 12);
  });

  it('expects a period from T0, else the last period, else the rig length', () => {
    const i = input();
    expect(expectedPeriod(i.live, i.result, i.rig)).toBe(i.result.T0_s);
    expect(expectedPeriod({ ...i.live, periodS: 2.5 }, { ...i.result, T0_s: null }, i.rig)).toBe(2.5);
    // 2π√(L/g) at standard gravity 9.80665 m/s² (CGPM 1901) for the 1.5 m night rig.
    expect(expectedPeriod({ ...i.live, periodS: null }, { ...i.result, T0_s: null }, i.rig)).toBeCloseTo(2 * Math.PI * Math.sqrt(1.5 / 9.80665), 12);
  });

  it('says when the display is paused and since when the estimates run', () => {
    const vm = buildViewModel(input({ paused: true, restartedAt_s: 3600 }));
    expect(vm.title).toBe('halfswing demo · display paused');
    expect(vm.status.find((s) => s.label === 'estimates since')?.value).toBe('1:00:00');
  });

  it('shows a watched journal with its size, and a live journal path', () => {
    const w = buildViewModel(input({ feed: demoStatus({ sourceKind: 'watch', sourceLabel: 'night.journal', speed: null, connection: { kind: 'following' }, journal: { path: 'night.journal', bytes: 2_500_000 } }) }));
    expect(w.status.find((s) => s.label === 'journal')?.value).toBe('night.journal (2.50 MB)');
    expect(w.status.find((s) => s.label === 'mode')?.value).toBe('following the file');
  });

  it('gives a plain status line without escape codes, with the warnings after it', () => {
    const gate = { kind: 'gate-offset' as const, offset_m: 0.004, u_m: 0.0001, side: null };
    const line = plainStatusLine(buildViewModel(input({ result: { ...input().result, warnings: [gate] } })));
    expect(line).not.toMatch(/\x1b/);
    expect(line).toMatch(/T0=2\.4549\d+±0\.0000\d+ s/);
    expect(line).toContain('reboots=1');
    expect(line).toContain('! gate 4.0 mm off the lowest point');
  });
});
