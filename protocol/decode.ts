// Decoding of protocol v1 device lines. Never throws: every bad input becomes a typed rejection.
import { crc8 } from './crc8.ts';
import type { DecodeResult, DeviceRecord, RejectReason } from './records.ts';
import { MAX_HUMIDITY, MAX_LINE_BYTES } from './records.ts';

const HEX = /^(0|[1-9a-fA-F][0-9a-fA-F]*)$/;
const DEC = /^(0|[1-9][0-9]*)$/;
const CRC_TAIL = / \*([0-9a-fA-F]{2})$/;
const TOKEN = /^[\x21-\x7e]+$/;

function reject(reason: RejectReason, detail: string): DecodeResult {
  return { ok: false, reason, detail };
}

/** Parses canonical hex of at most `maxDigits` digits, or returns undefined. */
function parseHex(s: string | undefined, maxDigits: number): number | undefined {
  if (s === undefined || s.length > maxDigits || !HEX.test(s)) return undefined;
  // ≤ 12 hex digits is ≤ 48 bits, exact in a double.
  return parseInt(s, 16);
}

class FieldError {
  constructor(readonly reason: RejectReason, readonly detail: string) {}
}

function need(tokens: readonly string[], i: number, what: string): string {
  const t = tokens[i];
  if (t === undefined) throw new FieldError('missing-field', `missing ${what}`);
  return t;
}

function hexField(tokens: readonly string[], i: number, what: string, maxDigits: number): number {
  const v = parseHex(need(tokens, i, what), maxDigits);
  if (v === undefined) throw new FieldError('bad-field', `bad ${what} '${tokens[i]}'`);
  return v;
}

const TEMP = /^(0|-?[1-9][0-9]{0,4})$/;
const PRESS = /^(0|[1-9][0-9]{0,6})$/;
const HUM = /^(0|[1-9][0-9]{0,5})$/;

function decField(tokens: readonly string[], i: number, what: string, form: RegExp, max = Infinity): number {
  const s = need(tokens, i, what);
  const v = Number(s);
  if (!form.test(s) || v > max) throw new FieldError('bad-field', `bad ${what} '${s}'`);
  return v;
}

function arity(tokens: readonly string[], n: number, kind: string): void {
  if (tokens.length > n) throw new FieldError('extra-field', `${kind} has ${tokens.length - n} extra field(s)`);
}

function decodeHello(seq: number, t: readonly string[]): DeviceRecord {
  if (need(t, 0, 'magic') !== 'halfswing') throw new FieldError('bad-field', `hello magic '${t[0]}' is not 'halfswing'`);
  const kv = new Map<string, string>();
  const extra: Record<string, string> = {};
  for (const tok of t.slice(1)) {
    const eq = tok.indexOf('=');
    if (eq <= 0) throw new FieldError('bad-field', `hello field '${tok}' is not key=value`);
    const k = tok.slice(0, eq);
    if (kv.has(k)) throw new FieldError('bad-field', `hello field '${k}' repeated`);
    kv.set(k, tok.slice(eq + 1));
  }
  const get = (k: string): string => {
    const v = kv.get(k);
    if (v === undefined) throw new FieldError('missing-field', `hello lacks ${k}=`);
    return v;
  };
  const dec = (k: string, max: number): number => {
    const s = get(k);
    if (!DEC.test(s) || s.length > 12) throw new FieldError('bad-field', `bad ${k}='${s}'`);
    const v = Number(s);
    if (v > max) throw new FieldError('bad-field', `${k}=${s} out of range`);
    return v;
  };
  const proto = dec('proto', 255);
  const hz = dec('hz', 2 ** 40);
  const ch = dec('ch', 8);
  const fw = get('fw');
  const mcu = get('mcu');
  const bootS = get('boot');
  if (!/^[0-9a-fA-F]{4}$/.test(bootS)) throw new FieldError('bad-field', `bad boot='${bootS}'`);
  if (hz === 0) throw new FieldError('bad-field', 'hz=0');
  for (const [k, v] of kv) {
    if (!['proto', 'hz', 'ch', 'fw', 'mcu', 'boot'].includes(k)) extra[k] = v;
  }
  return { kind: 'H', seq, proto, fw, mcu, hz, ch, boot: parseInt(bootS, 16), extra };
}

function decodeBody(kind: string, seq: number, t: readonly string[]): DeviceRecord {
  switch (kind) {
    case 'H':
      return decodeHello(seq, t);
    case 'E': {
      const chS = need(t, 0, 'channel');
      if (!/^[0-7]$/.test(chS)) throw new FieldError('bad-field', `bad channel '${chS}'`);
      const e = need(t, 1, 'edge');
      if (e !== 'r' && e !== 'f') throw new FieldError('bad-field', `bad edge '${e}'`);
      const ticks = hexField(t, 2, 'ticks', 12);
      arity(t, 3, 'E');
      return { kind: 'E', seq, ch: Number(chS), edge: e, ticks };
    }
    case 'T': {
      const ticks = hexField(t, 0, 'ticks', 12);
      const lost = hexField(t, 1, 'lost', 8);
      const levels = hexField(t, 2, 'levels', 2);
      arity(t, 3, 'T');
      return { kind: 'T', seq, ticks, lost, levels };
    }
    case 'A': {
      const ticks = hexField(t, 0, 'ticks', 12);
      const temp = decField(t, 1, 'temp', TEMP);
      const press = decField(t, 2, 'press', PRESS);
      const hum = decField(t, 3, 'hum', HUM, MAX_HUMIDITY);
      arity(t, 4, 'A');
      return { kind: 'A', seq, ticks, temp, press, hum };
    }
    case 'S': {
      const state = hexField(t, 0, 'state', 2);
      arity(t, 1, 'S');
      return { kind: 'S', seq, state };
    }
    case 'R': {
      const status = need(t, 0, 'status');
      if (status !== 'ok' && status !== 'err') throw new FieldError('bad-field', `bad reply status '${status}'`);
      const cmd = need(t, 1, 'command');
      if (status === 'err') {
        const reason = need(t, 2, 'reason');
        arity(t, 3, 'R err');
        return { kind: 'R', seq, ok: false, cmd, reason, fields: [] };
      }
      return { kind: 'R', seq, ok: true, cmd, fields: t.slice(2) };
    }
    default:
      return { kind: 'unknown', letter: kind, seq, fields: t };
  }
}

/**
 * Decodes one device line (without its LF; one trailing CR is tolerated).
 * Char codes above 0x7e or below 0x20 are rejected as non-ASCII, so pass bytes as latin1 text.
 */
export function decodeLine(input: string): DecodeResult {
  const line = input.endsWith('\r') ? input.slice(0, -1) : input;
  if (line.length === 0) return reject('empty', 'empty line');
  if (line.length + 1 > MAX_LINE_BYTES) return reject('too-long', `${line.length + 1} bytes, over ${MAX_LINE_BYTES}`);
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c < 0x20 || c > 0x7e) return reject('non-ascii', `byte 0x${c.toString(16)} at ${i}`);
  }
  const m = CRC_TAIL.exec(line);
  if (!m) return reject('truncated', 'no " *hh" checksum at the end');
  const bodyEnd = line.length - 4;
  const want = parseInt(m[1]!, 16);
  const got = crc8(line, 0, bodyEnd);
  if (want !== got) return reject('bad-crc', `crc ${m[1]} but line gives ${got.toString(16).padStart(2, '0')}`);
  const tokens = line.slice(0, bodyEnd).split(' ');
  const kind = tokens[0]!;
  if (!/^[A-Z]$/.test(kind)) return reject('bad-syntax', `kind '${kind}' is not one uppercase letter`);
  if (tokens.some((tok) => !TOKEN.test(tok))) return reject('bad-syntax', 'empty field (double space)');
  const seq = parseHex(tokens[1], 4);
  if (seq === undefined) return reject(tokens[1] === undefined ? 'missing-field' : 'bad-field', `bad seq '${tokens[1] ?? ''}'`);
  try {
    return { ok: true, record: decodeBody(kind, seq, tokens.slice(2)) };
  } catch (e) {
    if (e instanceof FieldError) return reject(e.reason, e.detail);
    return reject('bad-syntax', String(e));
  }
}

/** Decodes raw line bytes (without LF) as received from a wire. */
export function decodeBytes(bytes: Uint8Array): DecodeResult {
  if (bytes.length > MAX_LINE_BYTES) return reject('too-long', `${bytes.length + 1} bytes, over ${MAX_LINE_BYTES}`);
  return decodeLine(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length).toString('latin1'));
}
