// The references sheet is the project's own: every docs/references.md anchor cited anywhere in the repository
// names a section of it, and nothing cites the old out-of-tree sheet by section number.
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { headingAnchors } from './markdown.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
const SKIP = new Set(['node_modules', '.git', 'artifacts', 'dist', 'build']);
const TEXT = /\.(ts|tsx|js|c|h|md|json|S)$|^Makefile$/;

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    if (SKIP.has(e.name)) return [];
    const p = join(dir, e.name);
    if (e.isDirectory()) return files(p);
    return TEXT.test(e.name) ? [p] : [];
  });
}

const sheet = readFileSync(join(root, 'docs/references.md'), 'utf8');
const anchors = headingAnchors(sheet);
const sources = files(root).map((f) => ({ name: relative(root, f), text: readFileSync(f, 'utf8') }));

describe('docs/references.md', () => {
  it('is cited by the code and tests, and every cited anchor exists in it', () => {
    const cited: string[] = [];
    const missing: string[] = [];
    for (const { name, text } of sources) {
      for (const m of text.matchAll(/docs\/references\.md#([A-Za-z0-9_-]+)/g)) {
        cited.push(m[1]!);
        if (!anchors.has(m[1]!)) missing.push(`${name}: #${m[1]}`);
      }
    }
    expect(new Set(cited).size).toBeGreaterThanOrEqual(10);
    expect(missing).toEqual([]);
  });

  it('no file cites a sheet outside the repository by section number', () => {
    const stale = sources
      .filter(({ name }) => name !== 'test/docs/docs-references.test.ts')
      .flatMap(({ name, text }) => [...text.matchAll(/reference[- ]values?(?:\.md)? §|reference sheet §|field notes §?\d/gi)].map((m) => `${name}: ${m[0]}`));
    expect(stale).toEqual([]);
  });

  it('README: the stopwatch comparison is worked for the 1 m bench rig (T0 = 2π√(1 m/g_n))', () => {
    const readme = readFileSync(join(root, 'README.md'), 'utf8');
    const para = readme.slice(readme.indexOf('timed by hand'), readme.indexOf('timed by hand') + 600);
    const T0 = 2 * Math.PI * Math.sqrt(1 / 9.80665); // docs/references.md#ref-period-ratio: 2.00640929259 s
    expect(para).toContain(`T0 = ${T0.toFixed(3)} s`);
    expect(para).toContain(`${(10 * T0).toFixed(2)} s`);
    // docs/references.md#ref-stopwatch: σ 0.10 s on the interval; σ_g/g = 2σ_T/T.
    const interval = 0.1 / (10 * T0);
    expect(para).toContain(`T comes to ${(100 * interval).toFixed(2)} %`);
    expect(para).toContain(`g to ${(200 * interval).toFixed(1)} %`);
    expect(para).toContain(`g comes to ${(200 * interval * Math.SQRT2).toFixed(1)} %`);
  });
});
