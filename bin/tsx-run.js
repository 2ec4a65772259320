#!/usr/bin/env node
// Runs one TypeScript file (first argument) through tsx; used by npm scripts such as `bench`.
import { register } from 'tsx/esm/api';
import { pathToFileURL } from 'node:url';
import { resolve } from 'node:path';

const file = process.argv[2];
if (!file) {
  process.stderr.write('usage: tsx-run.js FILE.ts [args...]\n');
  process.exit(2);
}
process.argv.splice(2, 1);
register();
await import(pathToFileURL(resolve(file)).href);
