// The heartbeat cadence a reader sees: the median spacing of the newest `T` lines' host times. The live store's
// silence warnings and a followed journal's "not being written" rule both take it from here.
import type { JournalEntry } from '../../protocol/journal.ts';

/** Heartbeat arrivals kept for the spacing estimate. */
const BEATS_KEPT = 9;

/** Median of the spacings of increasing times (a lost or late heartbeat does not move it). */
export function medianSpacing(times: readonly number[]): number | null {
  if (times.length < 2) return null;
  const d = times
    .slice(1)
    .map((t, i) => t - times[i]!)
    .filter((x) => x > 0)
    .sort((a, b) => a - b);
  return d.length ? d[Math.floor((d.length - 1) / 2)]! : null;
}

/** Notes the heartbeats among the entries; `interval_s` is their median spacing (s), null before two. */
export function heartbeatCadence(): { see(e: JournalEntry): void; reset(): void; interval_s(): number | null } {
  const beats: number[] = [];
  return {
    see(e) {
      if (e.kind !== 'data' || !e.line.startsWith('T ')) return;
      beats.push(e.hostUs / 1e6);
      if (beats.length > BEATS_KEPT) beats.shift();
    },
    reset: () => void (beats.length = 0),
    interval_s: () => medianSpacing(beats),
  };
}
