#!/usr/bin/env node
// Entry point of the `halfswing` CLI: the bundle built at install (dist/, see bin/build.js), or with
// HALFSWING_DEV=1 (`npm run dev -- …`) the TypeScript sources through tsx, so edits need no rebuild.
import { existsSync } from 'node:fs';

if (process.env.HALFSWING_DEV === '1') {
  const { register } = await import('tsx/esm/api');
  register();
  await import('../host/cli/run.ts');
} else {
  const bundle = new URL('../dist/halfswing.js', import.meta.url);
  if (existsSync(bundle)) await import(bundle.href);
  else {
    process.stderr.write("halfswing: the build is missing (dist/): run 'npm install' or 'npm run build' in the halfswing folder, or HALFSWING_DEV=1 to run the sources\n");
    process.exitCode = 1;
  }
}
