// Every relative link between the repository's Markdown documents resolves: the file exists, and so does the #anchor.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { headingAnchors, relativeLinks } from './markdown.ts';

const root = fileURLToPath(new URL('../../', import.meta.url));
const SKIP = new Set(['node_modules', '.git', 'artifacts', 'dist']);

function markdownFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    if (SKIP.has(e.name)) return [];
    const p = join(dir, e.name);
    if (e.isDirectory()) return markdownFiles(p);
    return e.name.endsWith('.md') ? [p] : [];
  });
}

const files = markdownFiles(root).map((f) => relative(root, f));

describe('links between docs', () => {
  it('finds the docs', () => {
    expect(files).toEqual(expect.arrayContaining(['README.md', 'protocol/SPEC.md', 'protocol/JOURNAL.md', 'hardware-notes/README.md']));
  });

  it.each(files)('%s: every relative link resolves', (file) => {
    const md = readFileSync(join(root, file), 'utf8');
    const broken: string[] = [];
    for (const link of relativeLinks(md)) {
      const [path, anchor] = link.split('#') as [string, string | undefined];
      const target = path === '' ? join(root, file) : resolve(dirname(join(root, file)), decodeURI(path));
      if (!existsSync(target)) {
        broken.push(`${link} (no such file)`);
        continue;
      }
      if (anchor !== undefined && target.endsWith('.md') && statSync(target).isFile()) {
        if (!headingAnchors(readFileSync(target, 'utf8')).has(anchor)) broken.push(`${link} (no heading #${anchor})`);
      }
    }
    expect(broken).toEqual([]);
  });
});

describe('the anchor rules the link check relies on', () => {
  it('follow GitHub: lower case, punctuation dropped, spaces to hyphens, repeats numbered', () => {
    const a = headingAnchors('# 4.1 `H` — hello\n## The rig line\n## Notes\n## Notes\n```\n# not a heading\n```\n');
    expect([...a]).toEqual(['41-h--hello', 'the-rig-line', 'notes', 'notes-1']);
  });
});
