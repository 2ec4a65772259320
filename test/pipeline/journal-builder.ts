// Hand-made journals for pipeline tests: exact edge times, heartbeats, and chosen faults, through the real codec.
import { encodeRecord } from '../../protocol/encode.ts';
import { parseJournalLine, journalData, journalHeader, JOURNAL_MAGIC, type JournalEntry } from '../../protocol/journal.ts';
import type { DeviceRecord } from '../../protocol/records.ts';

export interface Edge {
  readonly t: number;
  readonly edge: 'r' | 'f';
  readonly ch?: number;
}

export interface Built {
  readonly entries: JournalEntry[];
  readonly lines: string[];
}

/** Block/unblock edges (blocked = low) of passes centred at `mids` with transit `tau`. */
export function passEdges(mids: readonly number[], tau: number): Edge[] {
  return mids.flatMap((m) => [
    { t: m - tau / 2, edge: 'f' as const },
    { t: m + tau / 2, edge: 'r' as const },
  ]);
}

/**
 * A journal of one boot (or several, split at `reboots` host seconds): hello, edges and 1 s heartbeats, each line
 * received `latencyS` after it happened. `drop(line index)` removes lines; `mangle` may replace a line's text.
 */
export function buildJournal(opts: {
  edges: readonly Edge[];
  durationS: number;
  hz?: number;
  /** Rate error of the device clock: ticks run at hz·(1 + ppm·1e-6) per true second. */
  ppm?: number;
  tickOffset?: number;
  latencyS?: (i: number) => number;
  drop?: (i: number, r: DeviceRecord) => boolean;
  mangle?: (i: number, line: string) => string;
  reboots?: readonly number[];
  rigJson?: string;
}): Built {
  const hz = opts.hz ?? 16e6;
  const events: { t: number; make: (seq: number, ticks: number) => DeviceRecord }[] = [];
  for (const e of opts.edges) events.push({ t: e.t, make: (seq, ticks) => ({ kind: 'E', seq, ch: e.ch ?? 0, edge: e.edge, ticks }) });
  for (let s = 1; s < opts.durationS; s++) events.push({ t: s, make: (seq, ticks) => ({ kind: 'T', seq, ticks, lost: 0, levels: 1 }) });
  const boots = [0, ...(opts.reboots ?? [])];
  for (const [b, t] of boots.entries())
    events.push({ t: t + 1e-6, make: (seq) => ({ kind: 'H', seq, proto: 1, fw: '1.0.0', mcu: 'test', hz, ch: 2, boot: 0x1000 + b, extra: {} }) });
  events.sort((a, b) => a.t - b.t);
  const header = journalHeader({ start: new Date('2026-01-01T00:00:00Z'), rigJson: opts.rigJson ?? '{"length_m":1,"flag_width_m":0.0254}', source: 'test builder', withMagic: false });
  const lines: string[] = [JOURNAL_MAGIC, ...header];
  let seq = 0;
  let boot = 0;
  let i = 0;
  for (const ev of events) {
    while (boot + 1 < boots.length && ev.t >= boots[boot + 1]!) (boot++, (seq = 0));
    const bootT = boots[boot]!;
    const ticks = Math.round((ev.t - bootT) * hz * (1 + (opts.ppm ?? 0) * 1e-6)) + (opts.tickOffset ?? 0);
    const rec = ev.make(seq, ticks % 2 ** 48);
    seq = (seq + 1) % 0x10000;
    const idx = i++;
    if (opts.drop?.(idx, rec)) continue;
    let line = encodeRecord(rec);
    if (opts.mangle) line = opts.mangle(idx, line);
    lines.push(journalData((ev.t + (opts.latencyS?.(idx) ?? 5e-4)) * 1e6, line));
  }
  return { lines, entries: lines.map(parseJournalLine) };
}
