// How long a device line spent on the serial wire: its host stamp is its LF's arrival, its ticks were read before it.
//
// The board reads a record's ticks before it sends the line; the host stamps the line when its last byte (the LF)
// arrives. Between the two lies the line's transmit time, bytes × 10 bits / baud (8N1: start bit, 8 data bits, stop
// bit; protocol/SPEC.md §1). Heartbeat lines grow by a hex digit as their sequence and tick fields grow (40 µs at
// 250000 baud each time), which a clock fit on raw stamps reads as a rate error (about −0.03 ppm over a 2-hour run,
// more on shorter ones). The send start, stamp − transmit time, removes it: the journal keeps the raw stamps.
import { DEFAULT_BAUD } from '../../protocol/link-defaults.ts';

/** Bits on the wire per byte at 8N1. */
const BITS_PER_BYTE = 10;

/**
 * µs a device line and its LF take on a UART at `baud`. The journal keeps the line without its LF (and without a CR
 * the board may send before it: one byte more on every line, a constant that no rate or offset fit sees change).
 */
export function lineWireUs(line: string, baud: number): number {
  return ((line.length + 1) * BITS_PER_BYTE * 1e6) / baud;
}

/**
 * The serial rate of a journal section: its `connect` annotation's `baud=N`. A journal written before the
 * annotation said it gets the shipped firmware's rate (DEFAULT_BAUD, 250000), which `record` and `live` use by
 * default; a run recorded at another rate then keeps part of the bias (at 115200 about half of it).
 */
export class LinkBaud {
  baud = DEFAULT_BAUD;

  /** A `connect` annotation's text: its stated rate, or the default when it states none. */
  connect(stated: number | null): void {
    this.baud = stated ?? DEFAULT_BAUD;
  }

  /** Host µs at which a line stamped `hostUs` began to leave the board. */
  sentUs(hostUs: number, line: string): number {
    return hostUs - lineWireUs(line, this.baud);
  }
}
