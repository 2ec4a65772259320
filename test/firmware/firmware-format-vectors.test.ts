// The firmware's C formatter, CRC and command parser, built for this machine, against protocol/vectors.json,
// the CRC catalogue check value and the TypeScript encoder.
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { expect, it } from 'vitest';
import { encodeRecord } from '../../protocol/encode.ts';
import type { DeviceRecord } from '../../protocol/records.ts';
import { REPO_ROOT } from '../../sim/emulator/toolchain.ts';
import { describeFirmware } from './toolchain-gate.ts';

const CHECKER = `${REPO_ROOT}firmware/build/host/format-check`;

/** Sends requests to the host-built checker in one process; one answer line per request. */
function ask(requests: readonly string[]): string[] {
  const out = execFileSync(CHECKER, { input: requests.map((r) => `${r}\n`).join('') }).toString('latin1');
  const lines = out.split('\n');
  lines.pop();
  expect(lines).toHaveLength(requests.length);
  return lines;
}

const h = (n: number): string => n.toString(16);

/** The checker request that makes the firmware format this record, or undefined for kinds it never sends. */
function request(r: DeviceRecord): string | undefined {
  switch (r.kind) {
    case 'E':
      return `E ${h(r.seq)} ${r.ch} ${r.edge} ${h(r.ticks)}`;
    case 'T':
      return `T ${h(r.seq)} ${h(r.ticks)} ${h(r.lost)} ${h(r.levels)}`;
    case 'H': {
      const keys = Object.keys(r.extra);
      if (r.fw !== '1.0.0' || r.mcu !== 'm328p' || r.hz !== 16e6 || r.ch !== 2) return undefined;
      if (keys.some((k) => k !== 'rc')) return undefined;
      return `H ${h(r.seq)} ${h(r.boot)} ${r.extra.rc ?? '-'}`;
    }
    case 'R': {
      if (!r.ok) return `Rerr ${h(r.seq)} ${r.cmd} ${r.reason}`;
      const [field, ...rest] = r.fields;
      const m = /^(ms|mask)=([0-9a-f]+)$/.exec(field ?? '');
      if (!m || rest.length > 0) return undefined;
      return m[1] === 'ms' ? `Rok ${h(r.seq)} ${r.cmd} ms ${m[2]} d` : `Rok ${h(r.seq)} ${r.cmd} mask ${parseInt(m[2]!, 16)} x`;
    }
    case 'A':
      return `A ${h(r.seq)} ${h(r.ticks)} ${r.temp} ${r.press} ${r.hum}`;
    case 'S':
      return `S ${h(r.seq)} ${h(r.state)}`;
    default:
      return undefined;
  }
}

interface Vector {
  line: string;
  ok: boolean;
  record?: DeviceRecord;
}
const vectors: { crc_check: { input: string; crc: number }; vectors: Vector[] } = JSON.parse(
  readFileSync(new URL('../../protocol/vectors.json', import.meta.url), 'utf8'),
);

describeFirmware('firmware formatter (host build of firmware/src/report.c, crc8.c, command.c)', () => {
  it('CRC-8/SMBUS of "123456789" is 0xf4 (check value, Catalogue of parametrised CRC algorithms, CRC-8/SMBUS)', () => {
    expect(ask([`crc ${vectors.crc_check.input}`])).toEqual([h(vectors.crc_check.crc)]);
    expect(vectors.crc_check.crc).toBe(0xf4);
  });

  it('reproduces every canonical vector of a kind the firmware sends, byte for byte', () => {
    const canonical = vectors.vectors.filter(
      (v) => v.ok && v.record && v.line === v.line.replace(/[A-F]/g, (c) => c.toLowerCase()).replace(/^./, (c) => c.toUpperCase()),
    );
    const cases = canonical.map((v) => ({ v, req: request(v.record!) })).filter((c) => c.req !== undefined);
    expect(cases.length).toBeGreaterThanOrEqual(10);
    const got = ask(cases.map((c) => c.req!));
    cases.forEach((c, i) => expect(got[i]).toBe(c.v.line));
  });

  it('formats E, T, A and S lines exactly as protocol/encode.ts does over random values (48-bit ticks, wrap of seq)', () => {
    const edge = fc.record({
      kind: fc.constant('E' as const),
      seq: fc.integer({ min: 0, max: 0xffff }),
      ch: fc.integer({ min: 0, max: 1 }),
      edge: fc.constantFrom('r' as const, 'f' as const),
      ticks: fc.oneof(fc.integer({ min: 0, max: 2 ** 48 - 1 }), fc.integer({ min: 0, max: 0x1ffff })),
    });
    const beat = fc.record({
      kind: fc.constant('T' as const),
      seq: fc.integer({ min: 0, max: 0xffff }),
      ticks: fc.integer({ min: 0, max: 2 ** 48 - 1 }),
      lost: fc.integer({ min: 0, max: 0xffffffff }),
      levels: fc.integer({ min: 0, max: 3 }),
    });
    const air = fc.record({
      kind: fc.constant('A' as const),
      seq: fc.integer({ min: 0, max: 0xffff }),
      ticks: fc.integer({ min: 0, max: 2 ** 48 - 1 }),
      temp: fc.integer({ min: -99999, max: 99999 }),
      press: fc.integer({ min: 0, max: 9_999_999 }),
      hum: fc.integer({ min: 0, max: 100_000 }),
    });
    const state = fc.record({ kind: fc.constant('S' as const), seq: fc.integer({ min: 0, max: 0xffff }), state: fc.integer({ min: 0, max: 0xff }) });
    const records = fc.sample(fc.oneof(edge, beat, air, state), { numRuns: 3000, seed: 20261201 }) as DeviceRecord[];
    const got = ask(records.map((r) => request(r)!));
    records.forEach((r, i) => expect(got[i]).toBe(encodeRecord(r)));
  });

  it('keeps the hello line within 80 bytes at the largest seq with the 5-character fw and rc', () => {
    const [line] = ask(['H ffff ffff 8']);
    expect(line!.length + 1).toBeLessThanOrEqual(80);
  });

  it('classifies random command lines as the contract says (property test against a reference reading)', () => {
    // The command grammar of protocol/SPEC.md read independently: `?`, `P <decimal 100..60000>`,
    // `C <hex mask 0..3>`, `A <decimal 0..3600>`; at most 16 bytes before the LF, a CR included; one trailing CR dropped; empty
    // lines ignored.
    const reference = (bytes: number[]): string => {
      const first = bytes[0] ?? 0;
      const letter = first > 0x20 && first < 0x7f ? String.fromCharCode(first) : '-';
      if (bytes.length > 16) return `error ${letter} too-long`;
      let n = bytes.length;
      if (n > 0 && bytes[n - 1] === 0x0d) n--;
      if (n === 0) return 'none';
      const text = String.fromCharCode(...bytes.slice(0, n));
      const arg = text.slice(2);
      const number = (re: RegExp, base: number, lo: number, hi: number, kind: string): string => {
        if (text[1] !== ' ' || !re.test(arg)) return `error ${letter} syntax`;
        const v = parseInt(arg, base);
        return v < lo || v > hi ? `error ${letter} range` : `${kind} ${letter}`;
      };
      if (letter === '?') return n === 1 ? 'hello ?' : 'error ? syntax';
      if (letter === 'P') return number(/^[0-9]+$/, 10, 100, 60000, 'period');
      if (letter === 'C') return number(/^[0-9a-fA-F]+$/, 16, 0, 3, 'channels');
      if (letter === 'A') return number(/^[0-9]+$/, 10, 0, 3600, 'air');
      return `error ${letter} unknown`;
    };
    const byte = fc.oneof(
      fc.constantFrom(0x3f, 0x50, 0x43, 0x41, 0x20, 0x0d, 0x30, 0x31, 0x39, 0x61, 0x46),
      fc.integer({ min: 0x00, max: 0xff }).filter((b) => b !== 0x0a),
    );
    const lines = fc.sample(
      fc.oneof(
        fc.array(byte, { minLength: 0, maxLength: 24 }),
        fc.tuple(fc.constantFrom('P ', 'C ', 'A '), fc.stringMatching(/^[0-9a-fA-F]{1,7}$/)).map(([a, b]) => [...Buffer.from(a + b)]),
      ),
      { numRuns: 3000, seed: 7 },
    );
    const got = ask(lines.map((l) => (l.length ? `cmd ${Buffer.from(l).toString('hex')}` : 'cmd')));
    lines.forEach((l, i) => {
      const [kind, letter, , reason] = got[i]!.split(' ');
      const summary = kind === 'none' ? 'none' : kind === 'error' ? `${kind} ${letter} ${reason}` : `${kind} ${letter}`;
      expect(summary, JSON.stringify(Buffer.from(l).toString('latin1'))).toBe(reference(l));
    });
  });

  it('parses commands and names each error with the contract tokens', () => {
    const hex = (s: string): string => Buffer.from(s, 'latin1').toString('hex');
    const cases: [string, string][] = [
      ['?', 'hello ? 0 -'],
      ['?\r', 'hello ? 0 -'],
      ['P 100', 'period P 100 -'],
      ['P 60000', 'period P 60000 -'],
      ['P 99', 'error P 99 range'],
      ['P 60001', 'error P 0 range'],
      ['P 99999999999', 'error P 0 range'],
      ['P', 'error P 0 syntax'],
      ['P x', 'error P 0 syntax'],
      ['P 1 2', 'error P 0 syntax'],
      ['C 3', 'channels C 3 -'],
      ['C 0', 'channels C 0 -'],
      ['C 4', 'error C 0 range'],
      ['C g', 'error C 0 syntax'],
      ['A 0', 'air A 0 -'],
      ['A 3600', 'air A 3600 -'],
      ['A 3601', 'error A 0 range'],
      ['A', 'error A 0 syntax'],
      ['A x', 'error A 0 syntax'],
      ['? 1', 'error ? 0 syntax'],
      ['Z', 'error Z 0 unknown'],
      ['p 100', 'error p 0 unknown'],
      ['\x01P', 'error - 0 unknown'],
      ['P 1000000000000000', 'error P 0 too-long'],
      ['x'.repeat(16), 'error x 0 unknown'],
      ['x'.repeat(17), 'error x 0 too-long'],
      ['x'.repeat(16) + '\r', 'error x 0 too-long'],
      ['P 60000\r', 'period P 60000 -'],
      ['\r', 'none'],
    ];
    const got = ask(cases.map(([c]) => `cmd ${hex(c)}`));
    // The range cases keep the value they saw only when it fits 16 bits; compare the fields that matter.
    cases.forEach(([cmd, want], i) => {
      const [kind, letter, , reason] = got[i]!.split(' ');
      const [wKind, wLetter, wValue, wReason] = want.split(' ');
      expect([cmd, kind, letter, reason]).toEqual([cmd, wKind, wLetter, wReason]);
      if (wKind !== 'error') expect(got[i]!.split(' ')[2]).toBe(wValue);
    });
  });
});
