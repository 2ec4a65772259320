import { describe, expect, it } from 'vitest';
import { crc8 as crcLib } from 'crc';
import fc from 'fast-check';
import { crc8, crc8Bytes } from '../../protocol/crc8.ts';

describe('CRC-8/SMBUS', () => {
  it('gives the catalogue check value 0xF4 for "123456789"', () => {
    // Source: Catalogue of parametrised CRC algorithms, CRC-8/SMBUS entry (check=0xf4); docs/references.md#ref-crc.
    expect(crc8('123456789')).toBe(0xf4);
    expect(crc8Bytes(new TextEncoder().encode('123456789'))).toBe(0xf4);
  });

  it('agrees with the crc package (its crc8 is poly 0x07, init 0) on random strings', () => {
    expect(crcLib('123456789')).toBe(0xf4);
    fc.assert(
      fc.property(fc.string({ unit: 'binary-ascii', maxLength: 90 }), (s) => {
        expect(crc8(s)).toBe(crcLib(Buffer.from(s, 'latin1')));
      }),
    );
  });

  it('leaves 0 when its own value is appended (residue 0x00, catalogue)', () => {
    const c = crc8('halfswing');
    expect(crc8('halfswing' + String.fromCharCode(c))).toBe(0);
  });
});
