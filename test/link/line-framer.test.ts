import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { LineFramer } from '../../host/link/line-framer.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { DeviceLines } from './helpers/device-lines.ts';

function frame(chunks: Uint8Array[], framer = new LineFramer()): { lines: string[]; framer: LineFramer } {
  const lines: string[] = [];
  for (const c of chunks) framer.push(c, (l) => lines.push(l));
  return { lines, framer };
}

/** Cuts `bytes` at the given positions (sorted, deduplicated). */
function cut(bytes: Buffer, at: number[]): Buffer[] {
  const pos = [...new Set(at.map((a) => a % (bytes.length + 1)))].sort((a, b) => a - b);
  const out: Buffer[] = [];
  let prev = 0;
  for (const p of pos) {
    out.push(bytes.subarray(prev, p));
    prev = p;
  }
  out.push(bytes.subarray(prev));
  return out;
}

describe('LineFramer', () => {
  const dev = new DeviceLines();
  const sample = [dev.hello(), dev.beat(16e6), dev.edge(0x3d0900, 'f'), dev.edge(0x3e0000, 'r'), dev.beat(32e6)];

  it('gives the same lines however the bytes are chunked, with LF or CR LF endings', () => {
    fc.assert(
      fc.property(fc.array(fc.nat(400), { maxLength: 40 }), fc.boolean(), (cuts, crlf) => {
        const bytes = Buffer.from(sample.map((l) => `${l}${crlf ? '\r\n' : '\n'}`).join(''), 'latin1');
        expect(frame(cut(bytes, cuts)).lines).toEqual(sample);
      }),
    );
  });

  it('cuts an over-long line to its first 80 bytes, which the decoder rejects as too-long, keeping the lines around it', () => {
    const long = `E 1 0 f ${'a'.repeat(200)}`;
    const { lines, framer } = frame([Buffer.from(`${sample[0]}\n${long}\n${sample[1]}\n`, 'latin1')]);
    expect(lines).toEqual([sample[0], long.slice(0, 80), sample[1]]);
    expect(decodeLine(lines[1]!)).toMatchObject({ ok: false, reason: 'too-long' });
    expect(framer.counts().overLong).toBe(1);
  });

  it('never holds more than the 80-byte protocol limit, whatever arrives without an LF', () => {
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 0, maxLength: 2000 }), (bytes) => {
        const f = new LineFramer();
        for (let i = 0; i < bytes.length; i += 7) {
          f.push(bytes.subarray(i, i + 7), () => {});
          expect(f.held()).toBeLessThanOrEqual(80);
        }
      }),
    );
  });

  it('passes a line of exactly 80 bytes with its LF, and one of 79 + CR LF, to the decoder', () => {
    // SPEC: at most 80 bytes including the LF (protocol/records.ts MAX_LINE_BYTES).
    const body79 = 'x'.repeat(79);
    const { lines, framer } = frame([Buffer.from(`${body79}\n${body79}\r\n${'y'.repeat(81)}\n`)]);
    expect(lines).toEqual([body79, body79, 'y'.repeat(80)]);
    expect(framer.counts().overLong).toBe(1);
  });

  it('passes garbage lines on as they are (the decoder counts them), bytes kept as latin1', () => {
    const { lines } = frame([Buffer.from([0xff, 0x00, 0x41, 0x0a, 0x0d, 0x0a])]);
    expect(lines).toEqual(['\xff\x00A', '']);
  });

  it('keeps a flushed tail only when it decodes: a record whose LF was lost at close', () => {
    const ok = frame([Buffer.from(`${sample[0]}\n${sample[1]}`, 'latin1')]);
    ok.framer.flush((l) => ok.lines.push(l));
    expect(ok.lines).toEqual([sample[0], sample[1]]);
    const half = frame([Buffer.from(`${sample[0]}\n${sample[1]!.slice(0, 9)}`, 'latin1')]);
    half.framer.flush((l) => half.lines.push(l));
    expect(half.lines).toEqual([sample[0]]);
    expect(half.framer.counts().tailsDiscarded).toBe(1);
  });

  it('recovers at the next LF after wrong-baud noise', () => {
    // At a wrong baud an AVR's bytes arrive as arbitrary values; LF bytes may appear anywhere.
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 500 }), (noise) => {
        const good = sample.map((l) => `${l}\n`).join('');
        const { lines } = frame([Buffer.from(noise), Buffer.from(`\n${good}`, 'latin1')]);
        expect(lines.slice(-sample.length)).toEqual(sample);
      }),
    );
  });
});
