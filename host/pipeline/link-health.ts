// What the link and the device lost on the way: rejected lines, sequence gaps, device drops, reboots, disconnects.
import type { DeviceRecord, RejectReason } from '../../protocol/records.ts';
import { SequenceTracker, type TrackedRecord } from '../../protocol/sequence.ts';
import type { RunCounts } from '../analysis/result.ts';
import { decodeDeviceLine } from './fast-decode.ts';
import type { EdgeCounts } from './pass-builder.ts';

/** A decoded record as the tracker placed it, and whether lines went missing just before it. */
export interface Tracked extends TrackedRecord {
  /** Lines were lost or rejected since the last good one (the pass builders must not join across them). */
  readonly gap: boolean;
}

/** Counters of the link's health, and the sequence tracker that finds gaps and reboots. */
export class LinkHealth {
  private readonly tracker = new SequenceTracker();
  private readonly c = { crc: 0, bad: 0, lost: 0, disconnects: 0, malformed: 0 };
  private rejectedSinceGood = 0;
  private readonly rejections: Partial<Record<RejectReason, number>> = {};
  /** Per boot: the largest `lost` count its heartbeats reported. */
  private readonly bootLost: number[] = [];

  /** Decodes a device line; a rejected line is counted by its reason and gives null. */
  decode(line: string): DeviceRecord | null {
    const r = decodeDeviceLine(line);
    if (r.ok) return r.record;
    if (r.reason === 'bad-crc') this.c.crc++;
    else this.c.bad++;
    this.rejections[r.reason] = (this.rejections[r.reason] ?? 0) + 1;
    this.rejectedSinceGood++;
    return null;
  }

  /** Sequence tracking of a good record: lost lines are counted once (rejected lines are already counted). */
  track(rec: DeviceRecord): Tracked {
    const tr = this.tracker.push(rec);
    let gap = false;
    if (tr.newBoot) this.bootLost[tr.bootIndex] = 0;
    else if (tr.lostBefore > 0) {
      this.c.lost += Math.max(0, tr.lostBefore - this.rejectedSinceGood);
      gap = true;
    } else gap = this.rejectedSinceGood > 0;
    this.rejectedSinceGood = 0;
    return { record: tr.record, lostBefore: tr.lostBefore, newBoot: tr.newBoot, bootIndex: tr.bootIndex, gap };
  }

  /** A heartbeat's count of edges the device dropped in boot `b` (cumulative within the boot). */
  deviceLost(b: number, lost: number): void {
    this.bootLost[b] = Math.max(this.bootLost[b] ?? 0, lost);
  }

  disconnect(): void {
    this.c.disconnects++;
  }

  malformed(): void {
    this.c.malformed++;
  }

  get malformedLines(): number {
    return this.c.malformed;
  }

  /** Decoder rejections by reason (a copy). */
  lineRejections(): Partial<Record<RejectReason, number>> {
    return { ...this.rejections };
  }

  /** The run's counts; the pass-level ones (rejected, bridged, unsequenced, long gaps) come from `extra`. */
  counts(edges: EdgeCounts | null, extra: Partial<RunCounts> = {}): RunCounts {
    const tt = this.tracker.totals();
    const e = edges ?? { glitches: 0, bounces: 0, resyncs: 0 };
    return {
      crc_errors: this.c.crc,
      bad_lines: this.c.bad,
      lines_lost: this.c.lost,
      device_lost: this.bootLost.reduce((s, v) => s + (v ?? 0), 0),
      rejected_passes: 0,
      bridged_gaps: 0,
      reboots: tt.reboots,
      disconnects: this.c.disconnects,
      unknown_kinds: tt.unknownKinds,
      glitches: e.glitches,
      bounces: e.bounces,
      edge_resyncs: e.resyncs,
      unsequenced_passes: 0,
      long_gaps: 0,
      malformed_journal_lines: this.c.malformed,
      ...extra,
    };
  }
}
