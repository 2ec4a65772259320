#!/usr/bin/env node
// Entry point of the `halfswing` CLI: runs the TypeScript sources through tsx, so no build step is needed.
import { register } from 'tsx/esm/api';

register();
const { runCli } = await import('../host/cli/main.ts');
process.exitCode = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  stdin: process.stdin,
  env: process.env,
  cwd: process.cwd(),
});
