// Heartbeat host stamps less the line's time on the wire: the clock fit no longer reads growing lines as a rate.
import { describe, expect, it } from 'vitest';
import { clockRateFromHost } from '../../host/analysis/clock-calibration.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { lineWireUs } from '../../host/pipeline/line-wire-time.ts';
import { connectBaud, connectBaudField, journalAnnotation, parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { DEFAULT_BAUD } from '../../protocol/link-defaults.ts';
import { buildJournal, passEdges } from './journal-builder.ts';

describe('a line on the wire', () => {
  it('takes (bytes + LF) × 10 bits / baud at 8N1 (protocol/SPEC.md §1: start bit, 8 data bits, stop bit)', () => {
    // 'T 1 f42400 0 1 *fc' is 18 bytes, 19 with its LF: 190 bits, 760 µs at 250000 baud, 1649.3 µs at 115200.
    expect(lineWireUs('T 1 f42400 0 1 *fc', 250_000)).toBeCloseTo(760, 9);
    expect(lineWireUs('T 1 f42400 0 1 *fc', 115_200)).toBeCloseTo(1649.305556, 5);
    // One more hex digit is 40 µs at the shipped firmware's 250000 baud.
    expect(lineWireUs('T 10 f42400 0 1 *fc', DEFAULT_BAUD) - lineWireUs('T 1 f42400 0 1 *fc', DEFAULT_BAUD)).toBeCloseTo(40, 9);
  });

  it('connect annotations state the baud; one that does not gives null', () => {
    expect(connectBaud(`/dev/ttyACM0 fw=1.0.0 boot=4c1d ${connectBaudField(250_000)}`)).toBe(250_000);
    expect(connectBaud(`sim0 (simulated rig) ${connectBaudField(115_200)}`)).toBe(115_200);
    expect(connectBaud('/dev/ttyACM0 fw=1.0.0 boot=4c1d')).toBeNull();
    expect(connectBaud('/dev/ttyACM0 xbaud=9600')).toBeNull();
    expect(connectBaud('baud=0')).toBeNull();
  });
});

/**
 * A 25-minute journal whose lines reach the host exactly their wire time after their ticks (no USB latency), at
 * `baud`, with a connect annotation stating `stated` (null: none). The heartbeats grow from `T 1 f42400 …` to
 * 9-digit ticks (past 2^32 ticks, 268 s) and 4-digit sequence numbers (line 4096, about 1370 s).
 */
function wireOnly(baud: number, stated: number | null, ppm: number): { entries: JournalEntry[]; raw: { deviceS: number[]; hostS: number[] } } {
  const mids = Array.from({ length: 1480 }, (_, k) => 2 + k * 1.0032);
  const b = buildJournal({ edges: passEdges(mids, 0.04), durationS: 1500, ppm, latencyS: () => 0 });
  const raw = { deviceS: [] as number[], hostS: [] as number[] };
  const lines = b.lines.flatMap((l) => {
    const e = parseJournalLine(l);
    if (e.kind !== 'data') return [l];
    const hostUs = Math.round(e.hostUs + lineWireUs(e.line, baud));
    if (e.line.startsWith('T ')) raw.deviceS.push(parseInt(e.line.split(' ')[2]!, 16) / 16e6), raw.hostS.push(hostUs / 1e6);
    const data = `${hostUs} ${e.line}`;
    return e.line.startsWith('H ') && stated !== null ? [journalAnnotation(hostUs, 'connect', `test0 ${connectBaudField(stated)}`), data] : [data];
  });
  return { entries: lines.map(parseJournalLine), raw };
}

describe('the host-clock fit on heartbeats whose lines grow', () => {
  it('gets the exact rate from the send times, where the LF stamps read growing lines as a rate error', () => {
    for (const baud of [250_000, 115_200]) {
      const { entries, raw } = wireOnly(baud, baud, 250);
      const r = analyzeEntries(entries);
      expect(r.clock_source).toBe('host');
      // The simulated truth is 250 ppm; the only delay is the wire, so the send times fit it to rounding (1 µs stamps).
      expect(Math.abs(r.clock_ppm! - 250)).toBeLessThan(0.002);
      // The same heartbeats by their LF stamps: the 40 µs (250000) or 87 µs (115200) steps read as a slower clock.
      const rawPpm = clockRateFromHost([{ boot: 0, ...raw }])!.ppm;
      expect(rawPpm - 250).toBeLessThan(baud === 250_000 ? -0.03 : -0.07);
    }
  });

  it('takes the firmware default (250000) when no connect annotation states the baud, as journals written before it', () => {
    expect(Math.abs(analyzeEntries(wireOnly(250_000, null, -80).entries).clock_ppm! + 80)).toBeLessThan(0.002);
    // A run at 115200 without the annotation is corrected by only 250000's share, and keeps about half the bias.
    const unstated = analyzeEntries(wireOnly(115_200, null, -80).entries).clock_ppm! + 80;
    expect(unstated).toBeLessThan(-0.03);
  });
});
