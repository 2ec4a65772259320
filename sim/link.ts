// From the device's UART to journal entries: serial timing, wire faults, USB frames and latency, disconnects.
import type { AnnotationWord } from '../protocol/journal.ts';
import type { DeviceLine } from './device.ts';
import type { Window } from './fault-schedule.ts';
import type { Rng } from './prng.ts';
import type { Faults, Scenario } from './scenario.ts';
import type { FaultCounts } from './truth.ts';

/** A journal entry as the recorder would write it (protocol/journal.ts shapes). */
export type SimEntry =
  | { readonly kind: 'data'; readonly hostUs: number; readonly line: string }
  | { readonly kind: 'annotation'; readonly hostUs: number; readonly word: AnnotationWord; readonly text: string };

export interface LinkOptions {
  readonly baud: number;
  readonly host: Scenario['host'];
  readonly faults: Faults;
  readonly disconnects: readonly Window[];
  readonly rng: Rng;
  readonly counts: FaultCounts;
  readonly tEnd: number;
  readonly portName: string;
}

/**
 * Replaces one byte of a line by a different printable ASCII character. CRC-8 catches every such change,
 * except a case swap of a checksum digit (the host reads hex in either case), which is never drawn.
 */
export function corruptLine(line: string, rng: Rng): string {
  for (;;) {
    const i = rng.int(0, line.length - 1);
    const old = line.charCodeAt(i);
    let c = rng.int(0x20, 0x7d);
    if (c >= old) c++;
    const ch = String.fromCharCode(c);
    if (i >= line.length - 2 && ch.toLowerCase() === line[i]!.toLowerCase()) continue;
    return line.slice(0, i) + ch + line.slice(i + 1);
  }
}

/** Yields host-side journal entries in host-time order for the device's lines. */
export function* linkEntries(lines: () => DeviceLine | undefined, o: LinkOptions): Generator<SimEntry> {
  const usbRng = o.rng.fork('usb');
  const wireRng = o.rng.fork('wire');
  const frame = o.host.usb_frame_us * 1e-6;
  const framePhase = frame > 0 ? usbRng.uniform() * frame : 0;
  const tail = o.host.usb_tail;
  const sigma = tail.sigma ?? 0.5;
  const logMu = Math.log(Math.max(tail.mean_us, 1e-9)) - (sigma * sigma) / 2;
  const drawTail = (): number =>
    (tail.kind === 'exponential' ? usbRng.exponential(tail.mean_us) : Math.exp(logMu + sigma * usbRng.normal())) * 1e-6;
  const us = (t: number) => Math.round(t * 1e6);
  let uartFree = 0;
  let lastHost = 0;
  let di = 0;
  let inside = false;

  yield { kind: 'annotation', hostUs: 0, word: 'connect', text: `${o.portName} (simulated rig)` };
  for (;;) {
    const l = lines();
    if (!l) break;
    const sent = Math.max(l.t, uartFree) + ((l.line.length + 1) * 10) / o.baud;
    uartFree = sent;
    // USB full-speed bulk data reaches the host at the next 1 ms frame, plus the driver's latency.
    const framed = frame > 0 ? framePhase + Math.ceil((sent - framePhase) / frame) * frame : sent;
    const host = Math.max(framed + drawTail(), lastHost);
    if (host > o.tEnd) break;
    lastHost = host;
    while (di < o.disconnects.length) {
      const w = o.disconnects[di]!;
      if (!inside && w.start <= host) {
        inside = true;
        o.counts.disconnects++;
        yield { kind: 'annotation', hostUs: us(w.start), word: 'disconnect', text: 'port lost (simulated)' };
      }
      if (inside && w.end <= host) {
        inside = false;
        di++;
        yield { kind: 'annotation', hostUs: us(w.end), word: 'connect', text: `${o.portName} reopened (simulated)` };
        continue;
      }
      break;
    }
    if (inside) {
      o.counts.lines_in_disconnect++;
      continue;
    }
    if (o.faults.lost_lines && wireRng.chance(o.faults.lost_lines.probability)) {
      o.counts.lines_lost++;
      continue;
    }
    let line = l.line;
    if (o.faults.corrupt && wireRng.chance(o.faults.corrupt.probability)) {
      line = corruptLine(line, wireRng);
      o.counts.lines_corrupted++;
    }
    o.counts.lines_journaled++;
    yield { kind: 'data', hostUs: us(host), line };
  }
  // Disconnect windows after the last line, within the run.
  for (; di < o.disconnects.length; di++) {
    const w = o.disconnects[di]!;
    if (!inside) {
      if (w.start > o.tEnd) break;
      o.counts.disconnects++;
      yield { kind: 'annotation', hostUs: us(w.start), word: 'disconnect', text: 'port lost (simulated)' };
    }
    inside = false;
    if (w.end <= o.tEnd) yield { kind: 'annotation', hostUs: us(w.end), word: 'connect', text: `${o.portName} reopened (simulated)` };
  }
}
