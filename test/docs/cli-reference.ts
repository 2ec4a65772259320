// Renders the README's CLI reference from the commands' own help text, so the README cannot drift from the CLI.
import { commandHelp, type Command } from '../../host/cli/command.ts';
import { COMMANDS } from '../../host/cli/registry.ts';

/** The markers that delimit the generated section in README.md. */
export const CLI_START = '<!-- cli-reference:start (generated from the help text by `npm run docs:cli`; do not edit by hand) -->';
export const CLI_END = '<!-- cli-reference:end -->';

/** Every registered command, loaded. */
export async function loadCommands(): Promise<Command[]> {
  return Promise.all(COMMANDS.map((c) => c.load()));
}

/** The Markdown of the CLI reference: a table of the commands, then each command's --help verbatim. */
export async function renderCliReference(): Promise<string> {
  const cmds = await loadCommands();
  const rows = COMMANDS.map((c) => `| [\`${c.name}\`](#halfswing-${c.name}) | ${c.summary.replace(/\|/g, '\\|')} |`);
  const sections = cmds.map((cmd) => `### halfswing ${cmd.name}\n\n\`\`\`text\n${commandHelp(cmd).trimEnd()}\n\`\`\``);
  return [
    'Every command prints this with `--help`; `npx halfswing --help` lists them.',
    '',
    '| command | what it does |',
    '| --- | --- |',
    ...rows,
    '',
    ...sections.flatMap((s) => [s, '']),
  ].join('\n');
}

/** The text between the markers of `readme`, or undefined when the markers are missing. */
export function cliSection(readme: string): string | undefined {
  const a = readme.indexOf(CLI_START);
  const b = readme.indexOf(CLI_END);
  if (a < 0 || b < a) return undefined;
  return readme.slice(a + CLI_START.length, b).replace(/^\n/, '').replace(/\n$/, '');
}

/** `readme` with the generated section replaced by `body`; throws when the markers are missing. */
export function withCliSection(readme: string, body: string): string {
  const a = readme.indexOf(CLI_START);
  const b = readme.indexOf(CLI_END);
  if (a < 0 || b < a) throw new Error(`README.md lacks the markers ${CLI_START} … ${CLI_END}`);
  return `${readme.slice(0, a + CLI_START.length)}\n${body}\n${readme.slice(b)}`;
}
