// The live state on one scenario each: passes a swing no longer clears are left out as in the full result, and
// the live clock says when the host-clock calibration starts. The every-scenario comparison with the full result is
// pipeline-live-estimate.test.ts.
import { describe, expect, it } from 'vitest';
import type { JournalEntry } from '../../protocol/journal.ts';
import { PASS_STATUSES } from '../../host/analysis/passes.ts';
import { MIN_HOST_SPAN_S } from '../../host/pipeline/clock-choice.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { AMPLITUDE_REL, entriesOf, feed, rel, statusOf } from './live-compare.ts';

describe('the live state leaves out what the full result leaves out', () => {
  it('a swing that no longer clears the beam: its passes are left out live as in the full result (demo-low-q)', () => {
    // The end of demo-low-q swings ±15 mm inside a 30 mm flag: live used to time those passes as half-periods.
    const entries = entriesOf('demo-low-q');
    const p = createRunPipeline();
    feed(p, entries, 0, entries.length);
    const r = p.result();
    const l = p.live();
    const valid = r.swings.filter((s) => statusOf(s) === 'valid');
    expect(l.lastPass?.status).toBe('unsequenced');
    // Passes kept coming for many swings after the last valid one, all left out.
    const after = r.swings.filter((s) => s.t_s > valid.at(-1)!.t_s);
    expect(after.length).toBeGreaterThan(10);
    expect(after.every((s) => statusOf(s) === 'unsequenced')).toBe(true);
    expect(rel(l.amplitudeDeg!, valid.at(-1)!.amplitude_deg!)).toBeLessThanOrEqual(AMPLITUDE_REL);
    expect(l.recent.t_s.at(-1)).toBeCloseTo(valid.at(-1)!.t_s, 6);
    expect(PASS_STATUSES).toContain(l.lastPass!.status);
  });
});

describe('the live clock says when the host-clock calibration starts', () => {
  it('nominal with its uncertainty until the heartbeats span 300 s, at the time it announced (demo-low-q)', () => {
    const entries = entriesOf('demo-low-q');
    const firstBeat = entries.find((e) => e.kind === 'data' && e.line.startsWith('T '))! as Extract<JournalEntry, { kind: 'data' }>;
    const p = createRunPipeline();
    const at = (s: number): number => entries.findIndex((e) => (e.kind === 'data' || e.kind === 'annotation') && e.hostUs > s * 1e6);
    let k = at(100);
    feed(p, entries, 0, k);
    const before = p.live().clock;
    expect(before.source).toBe('nominal');
    expect(before.ppm).toBe(0);
    expect(before.u_ppm).toBe(p.result().clock_u_ppm);
    // Projected: the first heartbeat + MIN_HOST_SPAN_S, on the host clock (the board runs ~120 ppm off: 0.04 s).
    expect(Math.abs(before.hostCalibrationFrom_s! - (firstBeat.hostUs / 1e6 + MIN_HOST_SPAN_S))).toBeLessThan(0.1);
    const from = before.hostCalibrationFrom_s!;
    const k1 = at(from - 1.5);
    feed(p, entries, k, k1);
    expect(p.result({ rows: false }).clock_source).toBe('nominal');
    expect(p.live().clock.source).toBe('nominal');
    k = at(from + 1.5);
    feed(p, entries, k1, k);
    const after = p.live().clock;
    expect(p.result({ rows: false }).clock_source).toBe('host');
    expect(after.source).toBe('host');
    // Once it has started, the time is where it did (the announced one, within a heartbeat).
    expect(Math.abs(after.hostCalibrationFrom_s! - from)).toBeLessThan(1.1);
    feed(p, entries, k, entries.length);
    expect(p.live().clock.hostCalibrationFrom_s).toBe(after.hostCalibrationFrom_s);
  });

  it('no calibration time when the clock is given or forced nominal', () => {
    const entries = entriesOf('ideal-60deg');
    for (const clock of [12.5, 'nominal'] as const) {
      const p = createRunPipeline({ clock });
      feed(p, entries, 0, entries.length);
      const c = p.live().clock;
      expect(c.hostCalibrationFrom_s).toBeNull();
      expect(c.ppm).toBe(clock === 'nominal' ? 0 : 12.5);
      expect(c.source).toBe(p.result({ rows: false }).clock_source);
    }
  });
});
