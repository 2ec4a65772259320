// Encoding of protocol v1 device lines: what the firmware and the simulator's device model emit.
import { crc8 } from './crc8.ts';
import type { DeviceRecord } from './records.ts';
import { MAX_LINE_BYTES, SEQ_MODULO } from './records.ts';

/** Lowercase hex without leading zeros (the single digit `0` for zero). */
export function hex(n: number): string {
  return n.toString(16);
}

/** Appends ` *<crc>` to a record body (kind letter to last field); no LF. */
export function seal(body: string): string {
  const c = crc8(body);
  return `${body} *${c < 16 ? '0' : ''}${c.toString(16)}`;
}

function body(r: DeviceRecord): string {
  const seq = hex(r.seq % SEQ_MODULO);
  switch (r.kind) {
    case 'H': {
      const boot = r.boot.toString(16).padStart(4, '0');
      const extra = Object.entries(r.extra).map(([k, v]) => ` ${k}=${v}`).join('');
      return `H ${seq} halfswing proto=${r.proto} fw=${r.fw} mcu=${r.mcu} hz=${r.hz} ch=${r.ch} boot=${boot}${extra}`;
    }
    case 'E':
      return `E ${seq} ${r.ch} ${r.edge} ${hex(r.ticks)}`;
    case 'T':
      return `T ${seq} ${hex(r.ticks)} ${hex(r.lost)} ${hex(r.levels)}`;
    case 'A':
      return `A ${seq} ${hex(r.ticks)} ${r.temp} ${r.press} ${r.hum}`;
    case 'S':
      return `S ${seq} ${hex(r.state)}`;
    case 'R': {
      const tail = r.ok ? r.fields.map((f) => ` ${f}`).join('') : ` ${r.reason ?? 'error'}`;
      return `R ${seq} ${r.ok ? 'ok' : 'err'} ${r.cmd}${tail}`;
    }
    case 'unknown':
      return `${r.letter} ${seq}${r.fields.map((f) => ` ${f}`).join('')}`;
  }
}

/**
 * Encodes a record as one protocol line without its LF.
 * Throws TypeError when the result would exceed the line limit: that is a programming error, not wire input.
 */
export function encodeRecord(r: DeviceRecord): string {
  const line = seal(body(r));
  if (line.length + 1 > MAX_LINE_BYTES) throw new TypeError(`encoded ${r.kind} line is ${line.length + 1} bytes, over ${MAX_LINE_BYTES}`);
  return line;
}
