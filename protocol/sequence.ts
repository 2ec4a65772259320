// Stream-level tracking of decoded records: sequence gaps (lines lost on the wire) and device reboots.
import type { DeviceRecord } from './records.ts';
import { SEQ_MODULO } from './records.ts';

/** What the tracker concluded about one record. */
export interface TrackedRecord {
  readonly record: DeviceRecord;
  /** Lines missing just before this one, by sequence number (0 when contiguous or at a boot). */
  readonly lostBefore: number;
  /** True when this record starts a new device boot (a new timebase). */
  readonly newBoot: boolean;
  /** 0 for the first boot seen, +1 for each reboot. */
  readonly bootIndex: number;
}

/** Running totals of a tracker. */
export interface SequenceCounts {
  readonly records: number;
  readonly linesLost: number;
  readonly reboots: number;
  readonly unknownKinds: number;
}

function ticksOf(r: DeviceRecord): number | undefined {
  return r.kind === 'E' || r.kind === 'T' || r.kind === 'A' ? r.ticks : undefined;
}

/**
 * Tracks sequence numbers and boots across a stream of decoded records.
 *
 * A reboot is recognised by a hello with a new boot id, or, when that hello was lost, by a break in the
 * sequence together with device ticks that run backwards by more than `backstepTicks` (edges may be
 * emitted a little out of tick order around a heartbeat, so a small backstep is not a reboot).
 */
export class SequenceTracker {
  private expected: number | undefined;
  private boot: number | undefined;
  private lastTicks: number | undefined;
  private hz = 16_000_000;
  private bootIndex = -1;
  private counts = { records: 0, linesLost: 0, reboots: 0, unknownKinds: 0 };

  /** Feeds one decoded record. */
  push(record: DeviceRecord): TrackedRecord {
    this.counts.records++;
    if (record.kind === 'unknown') this.counts.unknownKinds++;
    const ticks = ticksOf(record);
    let newBoot = false;
    if (this.bootIndex < 0) newBoot = true;
    else if (record.kind === 'H' && this.boot !== undefined && record.boot !== this.boot) newBoot = true;
    else if (
      record.seq !== this.expected &&
      ticks !== undefined &&
      this.lastTicks !== undefined &&
      ticks < this.lastTicks - this.hz / 2
    )
      newBoot = true;

    let lostBefore = 0;
    if (newBoot) {
      this.bootIndex++;
      if (this.bootIndex > 0) this.counts.reboots++;
      this.lastTicks = undefined;
      this.boot = record.kind === 'H' ? record.boot : undefined;
    } else if (this.expected !== undefined && record.seq !== this.expected) {
      lostBefore = (record.seq - this.expected + SEQ_MODULO) % SEQ_MODULO;
      this.counts.linesLost += lostBefore;
    }
    if (record.kind === 'H') {
      this.boot = record.boot;
      this.hz = record.hz;
    }
    if (ticks !== undefined) this.lastTicks = this.lastTicks === undefined ? ticks : Math.max(this.lastTicks, ticks);
    this.expected = (record.seq + 1) % SEQ_MODULO;
    return { record, lostBefore, newBoot, bootIndex: this.bootIndex };
  }

  /** Totals so far. */
  totals(): SequenceCounts {
    return { ...this.counts };
  }
}
