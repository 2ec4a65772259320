// From the device's UART to journal entries: serial timing, wire faults, USB frames and latency, disconnects.
import { connectBaudField, type AnnotationWord } from '../protocol/journal.ts';
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

/**
 * The link line by line: `open()` first, then `line()` for each device line until it returns undefined
 * (past the run's end), then `close()`. Lets a source that produces lines asynchronously (the emulated
 * firmware) share the model's serial timing, USB latency and wire faults.
 */
export class LinkModel {
  private readonly usbRng: Rng;
  private readonly wireRng: Rng;
  private readonly frame: number;
  private readonly framePhase: number;
  private readonly drawTail: () => number;
  private uartFree = 0;
  private lastHost = 0;
  private di = 0;
  private inside = false;

  constructor(private readonly o: LinkOptions) {
    this.usbRng = o.rng.fork('usb');
    this.wireRng = o.rng.fork('wire');
    this.frame = o.host.usb_frame_us * 1e-6;
    this.framePhase = this.frame > 0 ? this.usbRng.uniform() * this.frame : 0;
    const tail = o.host.usb_tail;
    const sigma = tail.sigma ?? 0.5;
    const logMu = Math.log(Math.max(tail.mean_us, 1e-9)) - (sigma * sigma) / 2;
    this.drawTail = (): number =>
      (tail.kind === 'exponential' ? this.usbRng.exponential(tail.mean_us) : Math.exp(logMu + sigma * this.usbRng.normal())) * 1e-6;
  }

  open(): SimEntry[] {
    return [{ kind: 'annotation', hostUs: 0, word: 'connect', text: `${this.o.portName} (simulated rig) ${connectBaudField(this.o.baud)}` }];
  }

  /** The entries one device line leads to; undefined once the line would reach the host after the run. */
  line(l: DeviceLine): SimEntry[] | undefined {
    const o = this.o;
    const out: SimEntry[] = [];
    const sent = Math.max(l.t, this.uartFree) + ((l.line.length + 1) * 10) / o.baud;
    this.uartFree = sent;
    // USB full-speed bulk data reaches the host at the next 1 ms frame, plus the driver's latency.
    const framed = this.frame > 0 ? this.framePhase + Math.ceil((sent - this.framePhase) / this.frame) * this.frame : sent;
    const host = Math.max(framed + this.drawTail(), this.lastHost);
    if (host > o.tEnd) return undefined;
    this.lastHost = host;
    while (this.di < o.disconnects.length) {
      const w = o.disconnects[this.di]!;
      if (!this.inside && w.start <= host) {
        this.inside = true;
        o.counts.disconnects++;
        out.push({ kind: 'annotation', hostUs: us(w.start), word: 'disconnect', text: 'port lost (simulated)' });
      }
      if (this.inside && w.end <= host) {
        this.inside = false;
        this.di++;
        out.push({ kind: 'annotation', hostUs: us(w.end), word: 'connect', text: `${o.portName} reopened (simulated) ${connectBaudField(o.baud)}` });
        continue;
      }
      break;
    }
    if (this.inside) {
      o.counts.lines_in_disconnect++;
      return out;
    }
    if (o.faults.lost_lines && this.wireRng.chance(o.faults.lost_lines.probability)) {
      o.counts.lines_lost++;
      return out;
    }
    let line = l.line;
    if (o.faults.corrupt && this.wireRng.chance(o.faults.corrupt.probability)) {
      line = corruptLine(line, this.wireRng);
      o.counts.lines_corrupted++;
    }
    o.counts.lines_journaled++;
    out.push({ kind: 'data', hostUs: us(host), line });
    return out;
  }

  /** Disconnect windows after the last line, within the run. */
  close(): SimEntry[] {
    const o = this.o;
    const out: SimEntry[] = [];
    for (; this.di < o.disconnects.length; this.di++) {
      const w = o.disconnects[this.di]!;
      if (!this.inside) {
        if (w.start > o.tEnd) break;
        o.counts.disconnects++;
        out.push({ kind: 'annotation', hostUs: us(w.start), word: 'disconnect', text: 'port lost (simulated)' });
      }
      this.inside = false;
      if (w.end <= o.tEnd) out.push({ kind: 'annotation', hostUs: us(w.end), word: 'connect', text: `${o.portName} reopened (simulated) ${connectBaudField(o.baud)}` });
    }
    return out;
  }
}

const us = (t: number): number => Math.round(t * 1e6);

/** Yields host-side journal entries in host-time order for the device's lines. */
export function* linkEntries(lines: () => DeviceLine | undefined, o: LinkOptions): Generator<SimEntry> {
  const link = new LinkModel(o);
  yield* link.open();
  for (let l = lines(); l; l = lines()) {
    const entries = link.line(l);
    if (!entries) break;
    yield* entries;
  }
  yield* link.close();
}
