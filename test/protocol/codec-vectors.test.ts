import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import type { DeviceRecord } from '../../protocol/records.ts';

interface Vector {
  line: string;
  ok: boolean;
  record?: DeviceRecord;
  reason?: string;
  note?: string;
}
const vectors: { vectors: Vector[] } = JSON.parse(readFileSync(new URL('../../protocol/vectors.json', import.meta.url), 'utf8'));

describe('protocol/vectors.json', () => {
  for (const v of vectors.vectors) {
    it(`${v.ok ? 'accepts' : `rejects (${v.reason})`}: ${JSON.stringify(v.line).slice(0, 60)}`, () => {
      const r = decodeLine(v.line);
      if (v.ok) {
        expect(r).toEqual({ ok: true, record: v.record });
      } else {
        expect(r.ok).toBe(false);
        if (!r.ok) expect(r.reason).toBe(v.reason);
      }
    });
  }

  it('the encoder reproduces every canonical (lower-case) valid vector byte for byte', () => {
    for (const v of vectors.vectors) {
      if (!v.ok || v.line !== v.line.toLowerCase().replace(/^./, (c) => c.toUpperCase())) continue;
      if (/[A-F]/.test(v.line.slice(1))) continue;
      expect(encodeRecord(v.record!)).toBe(v.line);
    }
  });

  it('accepts a CR LF line (the host strips one CR)', () => {
    const line = vectors.vectors[0]!.line;
    expect(decodeLine(line + '\r')).toEqual(decodeLine(line));
  });
});
