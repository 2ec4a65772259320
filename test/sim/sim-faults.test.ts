// Each injected fault shows in the journal exactly as often as the truth file says.
import { describe, expect, it } from 'vitest';
import { countKind, decodeRun, testScenario, type DecodedRun } from './sim-fixtures.ts';
import type { EdgeRecord, HeartbeatRecord } from '../../protocol/index.ts';

const edges = (r: DecodedRun) => r.records.filter((x) => x.record.kind === 'E') as { hostUs: number; record: EdgeRecord }[];
const beats = (r: DecodedRun) => r.records.filter((x) => x.record.kind === 'T') as { hostUs: number; record: HeartbeatRecord }[];
const bobEdges = (r: DecodedRun) => r.truth.passes.enter_s.length + r.truth.passes.exit_s.length;

/** Lines missing by seq, plus those lost before the first and after the last journaled line (one boot). */
function seqLosses(r: DecodedRun): number {
  const first = r.records[0]!.record.seq;
  const last = r.records[r.records.length - 1]!.record.seq;
  return r.tracker.totals().linesLost + first + (r.truth.faults.counts.lines_sent - 1 - last);
}

describe('wire faults', () => {
  it('lost lines: every loss is a sequence gap, and the counts agree', () => {
    const r = decodeRun(testScenario({ faults: { lost_lines: { probability: 0.02 } } }), 11, 300);
    const c = r.truth.faults.counts;
    expect(c.lines_lost).toBeGreaterThan(5);
    expect(r.rejected).toHaveLength(0);
    expect(r.records.length).toBe(c.lines_sent - c.lines_lost);
    expect(seqLosses(r)).toBe(c.lines_lost);
  });

  it('corrupted bytes: every corrupted line is rejected by the decoder, none else', () => {
    const r = decodeRun(testScenario({ faults: { corrupt: { probability: 0.03 } } }), 12, 300);
    const c = r.truth.faults.counts;
    expect(c.lines_corrupted).toBeGreaterThan(5);
    expect(r.rejected).toHaveLength(c.lines_corrupted);
    expect(seqLosses(r)).toBe(c.lines_corrupted);
  });

  it('disconnects: annotated, no data inside, the missing lines are the truth count', () => {
    const r = decodeRun(testScenario({ faults: { disconnect: { at_s: [30, 70], duration_s: [3, 5] } } }), 13, 120);
    const c = r.truth.faults.counts;
    expect(c.disconnects).toBe(2);
    expect(r.annotations.filter((a) => a.word === 'disconnect')).toHaveLength(2);
    expect(r.annotations.filter((a) => a.word === 'connect')).toHaveLength(3); // the opening one + two reconnects
    for (const w of r.truth.faults.schedule.disconnects)
      expect(r.records.filter((x) => x.hostUs >= w.start * 1e6 && x.hostUs < w.end * 1e6)).toHaveLength(0);
    expect(c.lines_in_disconnect).toBeGreaterThan(4);
    expect(seqLosses(r)).toBe(c.lines_in_disconnect);
  });

  it('a disconnect with reset on connect reboots the device at the reconnect', () => {
    const r = decodeRun(testScenario({ faults: { disconnect: { at_s: [30], duration_s: [2, 2], reset_on_connect: true } } }), 14, 60);
    expect(r.truth.faults.counts.reboots).toBe(1);
    expect(countKind(r, 'H')).toBe(2);
    expect(r.truth.clock.boots[1]!.cause).toBe('external');
    const h = r.records.filter((x) => x.record.kind === 'H')[1]!;
    expect(h.hostUs / 1e6).toBeGreaterThan(32);
  });
});

describe('gate faults', () => {
  it('bounce: E lines = bob edges + 2 per pulse, each pulse makes two short intervals, levels alternate', () => {
    const r = decodeRun(testScenario({ faults: { bounce: { probability: 0.3, pulses: [1, 3], width_us: [20, 100], gap_us: [10, 50] } } }), 15, 120);
    const c = r.truth.faults.counts;
    const e = edges(r);
    expect(c.bounce_pulses).toBeGreaterThan(10);
    expect(e.length).toBe(bobEdges(r) + 2 * c.bounce_pulses);
    let short = 0;
    for (let i = 1; i < e.length; i++) {
      expect(e[i]!.record.edge).not.toBe(e[i - 1]!.record.edge);
      if (e[i]!.record.ticks - e[i - 1]!.record.ticks < 16e6 * 200e-6) short++;
    }
    expect(short).toBe(2 * c.bounce_pulses);
  });

  it('objects through the beam: one extra pulse per object unless it overlaps the bob (merged blocks counted from truth)', () => {
    const r = decodeRun(testScenario({ faults: { object: { at_s: [20, 50.3, 80.6], rate_per_h: 60, duration_ms: [100, 300] } } }), 16, 120);
    const t = r.truth;
    const blocks = [
      ...t.passes.enter_s.map((s, i) => ({ start: s + t.release_host_s, end: t.passes.exit_s[i]! + t.release_host_s })),
      ...t.faults.schedule.objects,
    ].sort((a, b) => a.start - b.start);
    let merged = 0;
    let end = -Infinity;
    for (const b of blocks) {
      if (b.start > end) merged++;
      end = Math.max(end, b.end);
    }
    expect(t.faults.counts.objects).toBe(t.faults.schedule.objects.length);
    expect(t.faults.counts.objects).toBeGreaterThanOrEqual(3);
    expect(edges(r).length).toBe(2 * merged);
    // A 100–300 ms block is far longer than any bob transit (≈ 0.05 s at 10°).
    const e = edges(r);
    const long = e.filter((x, i) => i > 0 && x.record.edge === 'r' && x.record.ticks - e[i - 1]!.record.ticks > 16e6 * 0.09);
    expect(long.length).toBeGreaterThanOrEqual(1);
  });
});

describe('device faults', () => {
  it('reboots: a new H with a new boot id, seq and ticks restart, the tracker counts each', () => {
    const r = decodeRun(testScenario({ faults: { reboot: { at_s: [40, 90], cause: 'watchdog' } } }), 17, 120);
    const c = r.truth.faults.counts;
    expect(c.reboots).toBe(2);
    expect(r.tracker.totals().reboots).toBe(2);
    const hs = r.records.filter((x) => x.record.kind === 'H');
    expect(hs).toHaveLength(3);
    expect(hs.map((h) => h.record.seq)).toEqual([0, 0, 0]);
    expect(new Set(r.truth.clock.boots.map((b) => b.boot_id)).size).toBe(3);
    expect(hs.map((h) => (h.record as { extra: Record<string, string> }).extra.rc)).toEqual(['1', '8', '8']);
    const after = r.records[r.records.indexOf(hs[1]!) + 1]!.record as { ticks?: number };
    expect(after.ticks ?? 0).toBeLessThan(16e6 * 1.1);
    // While resetting (1.6 s each), passes are missed without being counted by the device.
    expect(edges(r).length).toBe(bobEdges(r) - c.edges_missed_while_down);
  });

  it('device drops: edges missing and `lost` rises by exactly as many', () => {
    const r = decodeRun(testScenario({ faults: { device_drop: { at_s: [20, 60], duration_ms: [1500, 1500] } } }), 18, 120);
    const c = r.truth.faults.counts;
    expect(c.device_drop_windows).toBe(2);
    expect(c.edges_lost_by_device).toBeGreaterThanOrEqual(4);
    const t = beats(r);
    expect(t[t.length - 1]!.record.lost).toBe(c.edges_lost_by_device);
    expect(t.filter((x) => x.hostUs < 20e6).every((x) => x.record.lost === 0)).toBe(true);
    expect(edges(r).length).toBe(bobEdges(r) - c.edges_lost_by_device);
  });

  it('stall: no lines for its duration, heartbeats skipped, buffered edges come out after, overflow counted as lost', () => {
    const r = decodeRun(testScenario({ faults: { stall: { at_s: [30], duration_s: [5, 5] } }, device: { buffer_edges: 3 } }), 19, 60);
    const c = r.truth.faults.counts;
    const w = r.truth.faults.schedule.stalls[0]!;
    expect(c.stalls).toBe(1);
    expect(r.records.filter((x) => x.hostUs > w.start * 1e6 + 2000 && x.hostUs < w.end * 1e6)).toHaveLength(0);
    expect(c.heartbeats_skipped).toBeGreaterThanOrEqual(4);
    expect(c.heartbeats_skipped).toBeLessThanOrEqual(5);
    // About 10 edges in 5 s at T/2 ≈ 1 s: 3 buffered, the rest lost.
    expect(c.edges_lost_in_stall).toBeGreaterThanOrEqual(5);
    expect(c.edges_lost_by_device).toBe(c.edges_lost_in_stall);
    expect(beats(r).at(-1)!.record.lost).toBe(c.edges_lost_in_stall);
    expect(edges(r).length).toBe(bobEdges(r) - c.edges_lost_in_stall);
  });

  it('everything at once: the decoder rejects exactly the corrupted lines, and every count is non-zero', () => {
    const r = decodeRun(
      testScenario({
        faults: {
          bounce: { probability: 0.05, pulses: [1, 2], width_us: [20, 80], gap_us: [10, 40] },
          object: { at_s: [15], duration_ms: [200, 200] },
          lost_lines: { probability: 0.01 },
          corrupt: { probability: 0.01 },
          reboot: { at_s: [100] },
          disconnect: { at_s: [60], duration_s: [3, 3] },
          device_drop: { at_s: [40], duration_ms: [2000, 2000] },
          stall: { at_s: [140], duration_s: [4, 4] },
        },
        device: { buffer_edges: 2 },
      }),
      20,
      200,
    );
    const c = r.truth.faults.counts;
    expect(r.rejected).toHaveLength(c.lines_corrupted);
    for (const k of ['lines_lost', 'lines_corrupted', 'lines_in_disconnect', 'reboots', 'disconnects', 'stalls', 'edges_lost_by_device', 'bounce_pulses', 'objects'] as const)
      expect(c[k], k).toBeGreaterThan(0);
    expect(c.lines_journaled).toBe(r.records.length + r.rejected.length);
    expect(c.lines_sent - c.lines_journaled).toBe(c.lines_lost + c.lines_in_disconnect);
  });
});
