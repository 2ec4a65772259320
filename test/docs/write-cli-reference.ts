// `npm run docs:cli`: rewrites the CLI reference section of README.md from the commands' help (temp file + rename).
import { readFileSync, renameSync, writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { renderCliReference, withCliSection } from './cli-reference.ts';

const readme = fileURLToPath(new URL('../../README.md', import.meta.url));
const next = withCliSection(readFileSync(readme, 'utf8'), await renderCliReference());
const tmp = `${readme}.${process.pid}.tmp`;
writeFileSync(tmp, next);
renameSync(tmp, readme);
process.stdout.write('README.md: CLI reference regenerated\n');
