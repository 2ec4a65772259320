// Process entry of the CLI (the bundle's `halfswing.js`, or bin/halfswing.js from source): runs it on this process's streams.
import { runCli } from './main.ts';

process.exitCode = await runCli(process.argv.slice(2), {
  stdout: process.stdout,
  stderr: process.stderr,
  stdin: process.stdin,
  env: process.env,
  cwd: process.cwd(),
});
