// The ABNF grammar of protocol/SPEC.md, compiled as written, agrees with the reference codec and the shared vectors.
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import type { DeviceRecord } from '../../protocol/records.ts';
import { compileRule, parseRules } from './abnf.ts';
import { fencedBlocks } from './markdown.ts';

const read = (p: string): string => readFileSync(new URL(`../../${p}`, import.meta.url), 'utf8');
const spec = read('protocol/SPEC.md');
const rules = parseRules(
  fencedBlocks(spec)
    .filter((b) => b.info === 'abnf')
    .map((b) => b.lines.join('\n'))
    .join('\n'),
);
const deviceLine = compileRule(rules, 'device-line');
const commandLine = compileRule(rules, 'command-line');
const vectors = JSON.parse(read('protocol/vectors.json')).vectors as { line: string; ok: boolean; reason?: string; note?: string }[];

const hex = (max: number) => fc.integer({ min: 0, max });
const record: fc.Arbitrary<DeviceRecord> = fc.oneof(
  fc.record({ kind: fc.constant('E' as const), seq: hex(0xffff), ch: fc.integer({ min: 0, max: 7 }), edge: fc.constantFrom('r' as const, 'f' as const), ticks: fc.maxSafeNat().map((n) => n % 2 ** 48) }),
  fc.record({ kind: fc.constant('T' as const), seq: hex(0xffff), ticks: fc.maxSafeNat().map((n) => n % 2 ** 48), lost: hex(0xffffffff), levels: hex(0xff) }),
  fc.record({
    kind: fc.constant('H' as const),
    seq: hex(0xffff),
    proto: fc.constant(1),
    fw: fc.constantFrom('1.0.0', '0.1.0', '2.10'),
    mcu: fc.constant('m328p'),
    hz: fc.constantFrom(16e6, 8e6, 20e6),
    ch: fc.integer({ min: 1, max: 8 }),
    boot: hex(0xffff),
    extra: fc.constantFrom<Record<string, string>>({}, { rc: '8' }, { rc: '3' }),
  }),
  fc.record({ kind: fc.constant('R' as const), seq: hex(0xffff), ok: fc.constant(true), cmd: fc.constantFrom('P', 'C', 'A'), fields: fc.constantFrom(['ms=500'], ['mask=3'], ['s=10'], []) }),
  fc.record({ kind: fc.constant('A' as const), seq: hex(0xffff), ticks: fc.maxSafeNat().map((n) => n % 2 ** 48), temp: fc.integer({ min: -99999, max: 99999 }), press: fc.integer({ min: 0, max: 9_999_999 }), hum: fc.integer({ min: 0, max: 100_000 }) }),
  fc.record({ kind: fc.constant('S' as const), seq: hex(0xffff), state: hex(0xff) }),
  fc.record({ kind: fc.constant('R' as const), seq: hex(0xffff), ok: fc.constant(false), cmd: fc.constantFrom('P', 'C', '?', '-', 'X'), reason: fc.constantFrom('unknown', 'syntax', 'range', 'too-long'), fields: fc.constant([]) }),
);

describe('the ABNF of SPEC.md', () => {
  it('accepts every line the reference encoder writes (random records, fast-check)', () => {
    fc.assert(
      fc.property(record, (r) => {
        expect(encodeRecord(r) + '\n').toMatch(deviceLine);
      }),
      { numRuns: 2000 },
    );
  });

  it('accepts every accepted vector that is in canonical device form, and the CR LF form', () => {
    const canonical = vectors.filter((v) => {
      const d = decodeLine(v.line);
      return v.ok && d.ok && encodeRecord(d.record) === v.line;
    });
    expect(canonical.length).toBeGreaterThanOrEqual(10);
    for (const v of canonical) {
      expect(`${v.line}\n`).toMatch(deviceLine);
      expect(`${v.line}\r\n`).toMatch(deviceLine);
    }
  });

  it('describes only what a device sends: upper-case hex (accepted by hosts) is outside it', () => {
    const upper = vectors.find((v) => v.ok && v.note?.includes('upper-case'));
    expect(upper).toBeDefined();
    expect(`${upper!.line}\n`).not.toMatch(deviceLine);
  });

  it('rejects every vector the decoder rejects for its form (not for its checksum or length)', () => {
    const formal = vectors.filter((v) => !v.ok && v.reason !== 'bad-crc' && v.reason !== 'too-long');
    expect(formal.length).toBeGreaterThanOrEqual(12);
    for (const v of formal) expect(`${v.line}\n`, `${v.reason}: ${v.line}`).not.toMatch(deviceLine);
  });

  it('has no A, E, H, R, S or T line that is also an "other" kind', () => {
    const other = compileRule(rules, 'other');
    for (const k of 'AEHRST') expect(`${k} 1 x`).not.toMatch(other);
    expect('Q 1 x').toMatch(other);
  });

  it('commands: the host lines of section 5 match, malformed ones do not', () => {
    for (const ok of ['?', 'P 500', 'P 60000', 'P 100', 'C 3', 'C ff', 'C 0', 'A 0', 'A 10', 'A 3600']) expect(`${ok}\n`).toMatch(commandLine);
    for (const bad of ['P 0500', 'P 50', 'P', 'C', 'C 03', 'X', '? 1', 'P  500', 'A', 'A 010', 'A -1', 'A 36000']) expect(`${bad}\n`).not.toMatch(commandLine);
  });
});

describe('the ABNF compiler used above', () => {
  it('follows RFC 5234: quoted strings ignore case, %s strings and %x ranges do not, n*m repeats', () => {
    const r = parseRules('a = "ab" %s"C" 1*2d [e]\nd = %x30-31\ne = "x" / "y"');
    const re = compileRule(r, 'a');
    for (const ok of ['abC0', 'ABC01', 'aBC1x', 'abC0Y']) expect(ok).toMatch(re);
    for (const bad of ['abc0', 'abC', 'abC012', 'abC2', 'abC0z']) expect(bad).not.toMatch(re);
  });
});
