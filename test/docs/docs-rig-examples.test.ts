// The rig files shown in the docs parse and validate with the project's rig parser (protocol/rig.ts).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseSimpleRig } from '../../protocol/rig.ts';
import { fencedBlocks } from './markdown.ts';

const read = (p: string): string => readFileSync(new URL(`../../${p}`, import.meta.url), 'utf8');
const jsonBlocks = (p: string): string[] =>
  fencedBlocks(read(p))
    .filter((b) => b.info === 'json')
    .map((b) => b.lines.join('\n'));

describe('rig examples in the docs', () => {
  const worked = jsonBlocks('hardware-notes/measuring-the-rig.md');
  const first = jsonBlocks('README.md');

  it('the worked example and the README first-run rig exist', () => {
    expect(worked).toHaveLength(1);
    expect(first).toHaveLength(1);
  });

  it.each([...worked, ...first])('validates: %s', (text) => {
    const r = parseSimpleRig(text);
    expect(r.ok, r.ok ? '' : r.error).toBe(true);
  });

  it('the worked example carries the figures its text derives (L = A + r, the 0.36 mm budget rounded up)', () => {
    const r = parseSimpleRig(worked[0]!);
    if (!r.ok) throw new Error(r.error);
    // measuring-the-rig.md: A = 1188.42 mm, r = 31.75/2 mm.
    expect(r.rig.length_m).toBeCloseTo((1188.42 + 31.75 / 2) / 1000, 4);
    expect(r.rig.bob_diameter_m).toBe(0.03175);
    expect(r.rig.length_u_m).toBeGreaterThanOrEqual(Math.hypot(0.17, 0.14, 0.14, 0.2, 0.15) / 1000);
    // Mass of a 31.75 mm steel ball at 7850 kg/m³ (density: common practice, no source), as the text says.
    expect(r.rig.bob_mass_kg).toBeCloseTo((4 / 3) * Math.PI * 0.015875 ** 3 * 7850, 3);
  });

  it('a typo in a key is refused with the key named, as the notes promise', () => {
    const typo = worked[0]!.replace('"length_m"', '"lenght_m"');
    expect(parseSimpleRig(typo)).toMatchObject({ ok: false, error: expect.stringContaining('lenght_m') });
  });
});
