// A fast path for the two line kinds that make up nearly every journal (E and T), falling back to the full decoder.
// It accepts only canonical lowercase lines, which it decodes to exactly what protocol/decode.ts gives; anything
// else (upper case, bad CRC, odd spacing, other kinds) goes to decodeLine, so results and rejections are identical.
import { crc8 } from '../../protocol/crc8.ts';
import { decodeLine } from '../../protocol/decode.ts';
import type { DecodeResult } from '../../protocol/records.ts';

/** Value of a lowercase hex digit char code, or −1. */
function hexDigit(c: number): number {
  if (c >= 48 && c <= 57) return c - 48;
  if (c >= 97 && c <= 102) return c - 87;
  return -1;
}

let pos = 0;

/** Reads a canonical lowercase hex token of ≤ maxDigits digits ending at a space or `end`; −1 when not canonical. */
function hexToken(line: string, end: number, maxDigits: number): number {
  const start = pos;
  let v = 0;
  while (pos < end && line.charCodeAt(pos) !== 32) {
    const d = hexDigit(line.charCodeAt(pos));
    if (d < 0) return -1;
    v = v * 16 + d; // ≤ 12 digits = 48 bits, exact in a double
    pos++;
  }
  const len = pos - start;
  if (len === 0 || len > maxDigits || (len > 1 && line.charCodeAt(start) === 48)) return -1;
  return v;
}

/** Expects a single space at `pos` (not at `end`) and steps over it. */
function space(line: string, end: number): boolean {
  if (pos >= end || line.charCodeAt(pos) !== 32) return false;
  pos++;
  return true;
}

/** Decodes one device line like `decodeLine`, faster for canonical E and T lines. */
export function decodeDeviceLine(line: string): DecodeResult {
  const n = line.length;
  const k = line.charCodeAt(0);
  if (n < 12 || n > 79 || (k !== 69 && k !== 84) || line.charCodeAt(1) !== 32) return decodeLine(line);
  const end = n - 4;
  if (line.charCodeAt(end) !== 32 || line.charCodeAt(end + 1) !== 42) return decodeLine(line);
  const h1 = hexDigit(line.charCodeAt(n - 2));
  const h2 = hexDigit(line.charCodeAt(n - 1));
  if (h1 < 0 || h2 < 0 || crc8(line, 0, end) !== h1 * 16 + h2) return decodeLine(line);
  pos = 2;
  const seq = hexToken(line, end, 4);
  if (seq < 0 || !space(line, end)) return decodeLine(line);
  if (k === 69) {
    const ch = line.charCodeAt(pos) - 48;
    if (ch < 0 || ch > 7 || line.charCodeAt(pos + 1) !== 32) return decodeLine(line);
    const e = line.charCodeAt(pos + 2);
    if ((e !== 114 && e !== 102) || line.charCodeAt(pos + 3) !== 32) return decodeLine(line);
    pos += 4;
    const ticks = hexToken(line, end, 12);
    if (ticks < 0 || pos !== end) return decodeLine(line);
    return { ok: true, record: { kind: 'E', seq, ch, edge: e === 114 ? 'r' : 'f', ticks } };
  }
  const ticks = hexToken(line, end, 12);
  if (ticks < 0 || !space(line, end)) return decodeLine(line);
  const lost = hexToken(line, end, 8);
  if (lost < 0 || !space(line, end)) return decodeLine(line);
  const levels = hexToken(line, end, 2);
  if (levels < 0 || pos !== end) return decodeLine(line);
  return { ok: true, record: { kind: 'T', seq, ticks, lost, levels } };
}
