// The protocol and journal examples in protocol/SPEC.md and protocol/JOURNAL.md decode as the text says.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord, seal } from '../../protocol/encode.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { MAX_LINE_BYTES } from '../../protocol/records.ts';
import { parseRig } from '../../protocol/rig.ts';
import { fencedBlocks } from './markdown.ts';

const read = (p: string): string => readFileSync(new URL(`../../${p}`, import.meta.url), 'utf8');
const spec = read('protocol/SPEC.md');
const journal = read('protocol/JOURNAL.md');
const wireLines = fencedBlocks(spec)
  .filter((b) => b.info === 'wire')
  .flatMap((b) => b.lines);

describe('SPEC.md examples', () => {
  it('has wire examples of every record kind', () => {
    expect(new Set(wireLines.map((l) => l[0]))).toEqual(new Set(['H', 'E', 'T', 'R', 'A', 'S', 'X']));
  });

  it.each(wireLines)('%s decodes, and re-encodes to the same bytes', (line) => {
    const d = decodeLine(line);
    expect(d.ok, d.ok ? '' : `${d.reason}: ${d.detail}`).toBe(true);
    if (d.ok) expect(encodeRecord(d.record)).toBe(line);
  });

  it('device replies in the command exchange decode', () => {
    const replies = fencedBlocks(spec)
      .flatMap((b) => b.lines)
      .filter((l) => l.includes('→'))
      .map((l) => l.split('→')[1]!.trim());
    expect(replies.length).toBeGreaterThanOrEqual(4);
    for (const r of replies) expect(decodeLine(r)).toMatchObject({ ok: true, record: { kind: 'R' } });
  });

  it('the hello byte budget: the spec hello at seq ffff fills the line exactly, one byte more is too long', () => {
    const longest = wireLines.find((l) => l.startsWith('H ffff '));
    expect(longest).toBeDefined();
    expect(Buffer.byteLength(longest!, 'latin1') + 1).toBe(MAX_LINE_BYTES);
    const over = seal(longest!.slice(0, -4).replace('fw=1.0.0', 'fw=1.0.10'));
    expect(decodeLine(over)).toMatchObject({ ok: false, reason: 'too-long' });
  });
});

describe('JOURNAL.md example', () => {
  const blocks = fencedBlocks(journal).filter((b) => b.info === 'journal');
  const lines = blocks.flatMap((b) => b.lines);

  it('is one journal block that opens with the magic line', () => {
    expect(blocks).toHaveLength(1);
    expect(parseJournalLine(lines[0]!)).toEqual({ kind: 'magic', version: 1 });
  });

  it('every line parses as a journal line, and host time never decreases within a section', () => {
    let last = -1;
    for (const l of lines) {
      const e = parseJournalLine(l);
      expect(e.kind, l).not.toBe('malformed');
      if (e.kind === 'start') last = -1;
      if (e.kind === 'data' || e.kind === 'annotation') {
        expect(e.hostUs, l).toBeGreaterThanOrEqual(last);
        last = e.hostUs;
      }
    }
  });

  it('its #rig lines validate with parseRig', () => {
    const rigs = lines.map(parseJournalLine).filter((e) => e.kind === 'rig');
    expect(rigs.length).toBe(2);
    for (const r of rigs) expect(parseRig(r.kind === 'rig' ? r.json : '')).toMatchObject({ ok: true });
  });

  it('shows, as the text says, one damaged line (bad-crc) and one cut by the power loss (truncated)', () => {
    const rejected = lines
      .map(parseJournalLine)
      .flatMap((e) => (e.kind === 'data' ? [decodeLine(e.line)] : []))
      .flatMap((d) => (d.ok ? [] : [d.reason]));
    expect(rejected).toEqual(['bad-crc', 'truncated']);
  });

  it('has two sections, and connect, note and disconnect annotations', () => {
    const entries = lines.map(parseJournalLine);
    expect(entries.filter((e) => e.kind === 'start')).toHaveLength(2);
    const words = new Set(entries.flatMap((e) => (e.kind === 'annotation' ? [e.word] : [])));
    expect(words).toEqual(new Set(['connect', 'note', 'disconnect']));
  });
});
