// The README's CLI reference is the CLI's own help, and every command line quoted in the docs uses real options.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { COMMANDS } from '../../host/cli/registry.ts';
import { cliSection, loadCommands, renderCliReference } from './cli-reference.ts';
import { fencedBlocks } from './markdown.ts';

const read = (p: string): string => readFileSync(new URL(`../../${p}`, import.meta.url), 'utf8');
const readme = read('README.md');
/** The docs this area owns that quote `halfswing` command lines. */
const DOCS = [
  'README.md',
  'protocol/SPEC.md',
  'protocol/JOURNAL.md',
  ...['README', 'gates', 'wiring', 'placement', 'measuring-the-rig', 'suspension', 'release', 'clock', 'safety'].map(
    (n) => `hardware-notes/${n}.md`,
  ),
];

/** Every `halfswing <command> ...` invocation in a text: inline code spans and code-block lines. */
function invocations(md: string): { command: string; options: string[]; text: string }[] {
  const spans = [...md.matchAll(/`([^`\n]+)`/g)].map((m) => m[1]!);
  const blockLines = fencedBlocks(md).flatMap((b) => (b.info === 'text' ? [] : b.lines));
  const out: { command: string; options: string[]; text: string }[] = [];
  for (const s of [...spans, ...blockLines]) {
    for (const m of s.matchAll(/\bhalfswing ([a-z]+)((?: +[^ |#]+)*)/g)) {
      if (!COMMANDS.some((c) => c.name === m[1])) continue;
      out.push({ command: m[1]!, options: [...m[2]!.matchAll(/(?:^| )--([a-z][a-z0-9-]*)/g)].map((o) => o[1]!), text: s });
    }
  }
  return out;
}

describe('README CLI reference', () => {
  it('is exactly what the generator renders from the help text (run `npm run docs:cli` after changing a command)', async () => {
    expect(cliSection(readme)).toBe(await renderCliReference());
  });

  it('names every registered command and every option of each', async () => {
    const section = cliSection(readme) ?? '';
    for (const cmd of await loadCommands()) {
      expect(section).toContain(`### halfswing ${cmd.name}`);
      for (const opt of Object.keys(cmd.options)) expect(section, `${cmd.name} --${opt}`).toContain(`--${opt}`);
    }
  });

  it('lists no command the CLI does not have', () => {
    const listed = [...(cliSection(readme) ?? '').matchAll(/^### halfswing ([a-z]+)$/gm)].map((m) => m[1]);
    expect(listed).toEqual(COMMANDS.map((c) => c.name));
  });
});

describe('command lines quoted in the docs', () => {
  it.each(DOCS)('%s uses only commands and options the CLI has', async (doc) => {
    const cmds = new Map((await loadCommands()).map((c) => [c.name, c]));
    for (const inv of invocations(read(doc))) {
      const cmd = cmds.get(inv.command)!;
      for (const opt of inv.options) {
        expect(opt === 'help' || opt in cmd.options, `${doc}: '${inv.text}' uses --${opt}, which halfswing ${inv.command} does not have`).toBe(true);
      }
    }
  });

  it('the README quotes the commands a first run needs', () => {
    const used = new Set(invocations(readme).map((i) => i.command));
    for (const c of ['ports', 'probe', 'live', 'analyze']) expect(used, c).toContain(c);
  });
});
