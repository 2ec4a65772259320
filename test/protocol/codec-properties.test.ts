import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord, seal } from '../../protocol/encode.ts';
import { MAX_TICKS, type DeviceRecord } from '../../protocol/records.ts';

const seq = fc.integer({ min: 0, max: 0xffff });
const ticks = fc.integer({ min: 0, max: MAX_TICKS });
const edge = fc.record({ kind: fc.constant('E' as const), seq, ch: fc.integer({ min: 0, max: 7 }), edge: fc.constantFrom('r' as const, 'f' as const), ticks });
const beat = fc.record({ kind: fc.constant('T' as const), seq, ticks, lost: fc.integer({ min: 0, max: 0xffffffff }), levels: fc.integer({ min: 0, max: 0xff }) });
// Room readings over the whole contract range (protocol/SPEC.md 4.5) and every sensor state.
const air = fc.record({
  kind: fc.constant('A' as const),
  seq,
  ticks,
  temp: fc.integer({ min: -99999, max: 99999 }),
  press: fc.integer({ min: 0, max: 9_999_999 }),
  hum: fc.integer({ min: 0, max: 100_000 }),
});
const sensor = fc.record({ kind: fc.constant('S' as const), seq, state: fc.integer({ min: 0, max: 0xff }) });
const word = fc.stringMatching(/^[a-z0-9.]{1,10}$/);
const hello = fc.record({
  kind: fc.constant('H' as const),
  seq,
  proto: fc.constant(1),
  fw: fc.stringMatching(/^[0-9]\.[0-9]{1,2}\.[0-9]{1,2}$/),
  mcu: fc.stringMatching(/^[a-z0-9]{3,6}$/),
  hz: fc.integer({ min: 1, max: 20_000_000 }),
  ch: fc.integer({ min: 1, max: 8 }),
  boot: fc.integer({ min: 0, max: 0xffff }),
  extra: fc.oneof(fc.constant({}), fc.record({ rc: fc.constantFrom('1', '2', '4', '8') }), fc.record({ rc: fc.constantFrom('1', '2'), x: word })),
});
const reply = fc.oneof(
  fc.record({ kind: fc.constant('R' as const), seq, ok: fc.constant(true), cmd: fc.constantFrom('?', 'P', 'C'), fields: fc.array(word.map((w) => `k=${w}`), { maxLength: 3 }) }),
  fc.record({ kind: fc.constant('R' as const), seq, ok: fc.constant(false), cmd: fc.constantFrom('?', 'P', 'C', '-'), reason: word, fields: fc.constant([]) }),
);
const fits = (r: DeviceRecord): boolean => {
  try {
    encodeRecord(r);
    return true;
  } catch {
    return false;
  }
};
const anyRecord: fc.Arbitrary<DeviceRecord> = fc.oneof(edge, beat, hello.filter(fits), reply, air, sensor);

describe('codec round trip and rejection', () => {
  it('decode(encode(r)) = r for every record kind', () => {
    fc.assert(fc.property(anyRecord, (r) => {
        expect(decodeLine(encodeRecord(r))).toEqual({ ok: true, record: r });
      }), { numRuns: 3000 });
  });

  it('rejects every single-byte corruption of a valid line, unless it only changes the case of a checksum digit', () => {
    fc.assert(
      fc.property(anyRecord, fc.nat(), fc.integer({ min: 0, max: 255 }), (r, pos, byte) => {
        const line = encodeRecord(r);
        const i = pos % line.length;
        if (line.charCodeAt(i) === byte) return;
        const bad = line.slice(0, i) + String.fromCharCode(byte) + line.slice(i + 1);
        const d = decodeLine(bad);
        const caseOnlyInCrc = i >= line.length - 2 && line[i]!.toLowerCase() === String.fromCharCode(byte).toLowerCase();
        if (caseOnlyInCrc) expect(d).toEqual({ ok: true, record: r });
        else if (i === line.length - 1 && byte === 13) expect(d.ok).toBe(false);
        else expect(d.ok).toBe(false);
      }),
      { numRuns: 5000 },
    );
  });

  it('rejects truncation at every position', () => {
    fc.assert(
      fc.property(anyRecord, (r) => {
        const line = encodeRecord(r);
        for (let n = 0; n < line.length; n++) expect(decodeLine(line.slice(0, n)).ok).toBe(false);
      }),
      { numRuns: 300 },
    );
  });

  it('never throws and always returns a typed result, whatever the input', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary', maxLength: 200 }), (s) => {
        const d = decodeLine(s);
        expect(typeof d.ok).toBe('boolean');
        if (!d.ok) expect(d.reason).toMatch(/^[a-z-]+$/);
      }),
      { numRuns: 5000 },
    );
  });

  it('rejects over-long lines, non-ASCII bytes and missing fields', () => {
    expect(decodeLine('E 1 0 r 10 *00' + ' '.repeat(70))).toMatchObject({ ok: false, reason: 'too-long' });
    expect(decodeLine('E 1 0 r 1\u0080 *00')).toMatchObject({ ok: false, reason: 'non-ascii' });
    const noTicks = encodeRecord({ kind: 'T', seq: 1, ticks: 5, lost: 0, levels: 0 }).replace(/^T 1 5 /, 'T 1 ');
    expect(decodeLine(noTicks).ok).toBe(false);
  });

  it('rejects an A or S record with a field added or removed (fixed arity, like E and T)', () => {
    fc.assert(
      fc.property(fc.oneof(air, sensor), fc.boolean(), (r, add) => {
        const body = encodeRecord(r).slice(0, -4);
        const changed = add ? `${body} 1` : body.slice(0, body.lastIndexOf(' '));
        const d = decodeLine(seal(changed));
        expect(d).toMatchObject({ ok: false, reason: add ? 'extra-field' : 'missing-field' });
      }),
      { numRuns: 500 },
    );
  });

  it('keeps 48-bit ticks exact', () => {
    const r: DeviceRecord = { kind: 'E', seq: 1, ch: 0, edge: 'r', ticks: MAX_TICKS };
    const d = decodeLine(encodeRecord(r));
    expect(d.ok && d.record.kind === 'E' && d.record.ticks).toBe(281474976710655);
  });
});
