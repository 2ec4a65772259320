import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import vectors from '../../protocol/vectors.json' with { type: 'json' };
import { decodeDeviceLine } from '../../host/pipeline/fast-decode.ts';
import { parseJournalLineFast } from '../../host/journal/read-journal.ts';

const edge = fc.record({
  kind: fc.constant('E' as const),
  seq: fc.integer({ min: 0, max: 0xffff }),
  ch: fc.integer({ min: 0, max: 7 }),
  edge: fc.constantFrom('r' as const, 'f' as const),
  ticks: fc.integer({ min: 0, max: 2 ** 48 - 1 }),
});
const beat = fc.record({
  kind: fc.constant('T' as const),
  seq: fc.integer({ min: 0, max: 0xffff }),
  ticks: fc.integer({ min: 0, max: 2 ** 48 - 1 }),
  lost: fc.integer({ min: 0, max: 0xffffffff }),
  levels: fc.integer({ min: 0, max: 0xff }),
});
const air = fc.record({
  kind: fc.constant('A' as const),
  seq: fc.integer({ min: 0, max: 0xffff }),
  ticks: fc.integer({ min: 0, max: 2 ** 48 - 1 }),
  temp: fc.integer({ min: -99999, max: 99999 }),
  press: fc.integer({ min: 0, max: 9_999_999 }),
  hum: fc.integer({ min: 0, max: 100_000 }),
});
const printable = fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c));

describe('fast E/T decoding gives exactly what protocol/decode.ts gives', () => {
  it('on every shared test vector', () => {
    for (const v of vectors.vectors) expect(decodeDeviceLine(v.line)).toEqual(decodeLine(v.line));
  });

  it('on valid lines and on every kind of single-character damage (property)', () => {
    fc.assert(
      fc.property(fc.oneof(edge, beat, air), fc.nat(), printable, fc.nat(), (rec, at, ch, cut) => {
        const line = encodeRecord(rec);
        expect(decodeDeviceLine(line)).toEqual(decodeLine(line));
        const i = at % line.length;
        const damaged = line.slice(0, i) + ch + line.slice(i + 1);
        expect(decodeDeviceLine(damaged)).toEqual(decodeLine(damaged));
        const truncated = line.slice(0, cut % line.length);
        expect(decodeDeviceLine(truncated)).toEqual(decodeLine(truncated));
        expect(decodeDeviceLine(line.toUpperCase())).toEqual(decodeLine(line.toUpperCase()));
        expect(decodeDeviceLine(`${line}\r`)).toEqual(decodeLine(`${line}\r`));
      }),
      { numRuns: 2000 },
    );
  });
});

describe('fast journal line parsing gives exactly what protocol/journal.ts gives', () => {
  it('on data lines, headers, annotations and odd lines (property)', () => {
    const fixed = ['#halfswing-journal 1', '#@12 disconnect port lost', '0 E 0 0 r 0 *b0', '007 x', '12345678901234567 x', '12 ', '12', '#rig {}', '5 T 1 2 0 0 *00\r', ''];
    for (const l of fixed) expect(parseJournalLineFast(l)).toEqual(parseJournalLine(l));
    fc.assert(
      fc.property(fc.oneof(fc.string(), fc.tuple(fc.nat(), fc.string()).map(([n, s]) => `${n} ${s}`), fc.tuple(fc.nat(), fc.string()).map(([n, s]) => `${n}${s}`)), (l) => {
        expect(parseJournalLineFast(l)).toEqual(parseJournalLine(l));
      }),
      { numRuns: 3000 },
    );
  });
});
