#!/usr/bin/env node
// Bundles the host into dist/ (run by `prepare`, so on every `npm install` and `npm ci`): the CLI and the
// result worker as ES modules with shared chunks, every package in node_modules left as an import but zod.
//
//   node bin/build.js [OUTDIR]     default dist/ in the repository; OUTDIR must sit inside the repository so
//                                  that the bundle's package imports resolve to its node_modules
import { build } from 'esbuild';
import { readFile, rm } from 'node:fs/promises';
import { dirname, relative, resolve, sep } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');

/**
 * Some modules find files beside themselves (`new URL('../../', import.meta.url)`: the scenarios, the firmware
 * build). In a bundle every module shares the chunk's URL, so each source's `import.meta.url` is replaced by its
 * own URL, computed from the chunk's at run time: the bundle keeps working when the checkout moves. A module
 * that tests `import.meta.bundled` (defined true below) means the bundle's own files and is left alone.
 */
function sourceUrlPlugin(outdir) {
  return {
    name: 'source-import-meta-url',
    setup(b) {
      b.onLoad({ filter: /\.tsx?$/ }, async (args) => {
        if (args.path.includes(`${sep}node_modules${sep}`)) return undefined;
        const text = await readFile(args.path, 'utf8');
        if (!text.includes('import.meta.url') || text.includes('import.meta.bundled')) return undefined;
        const rel = relative(outdir, args.path).split(sep).join('/');
        const own = `new URL(${JSON.stringify(rel)}, import.meta.url).href`;
        return { contents: text.replaceAll('import.meta.url', own), loader: args.path.endsWith('x') ? 'tsx' : 'ts' };
      });
    },
  };
}

/**
 * Packages stay imports from node_modules, except those listed here, which are bundled: zod's package entry
 * loads about 110 files (every locale, JSON Schema conversion both ways) for ≈ 0.1 s, as long as Node itself
 * takes to start, on every command that reads a rig; bundled, only the parts the rig schema uses remain.
 */
const BUNDLED_PACKAGES = /^zod(\/|$)/;

function externalPackagesPlugin() {
  return {
    name: 'external-packages-but-some',
    setup(b) {
      b.onResolve({ filter: /^[^./]/ }, (args) => (BUNDLED_PACKAGES.test(args.path) ? undefined : { path: args.path, external: true }));
    },
  };
}

/** Builds the bundle into `outdir` (emptied first). */
export async function buildBundle(outdir = resolve(ROOT, 'dist')) {
  if (relative(ROOT, outdir).startsWith('..')) throw new Error(`the bundle must be built inside the repository, not in ${outdir}`);
  await rm(outdir, { recursive: true, force: true });
  await build({
    absWorkingDir: ROOT,
    entryPoints: { halfswing: 'host/cli/run.ts', 'result-worker': 'host/pipeline/result-worker.ts' },
    outdir,
    bundle: true,
    splitting: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    // The chunks sit beside the entries: a chunk's URL + './result-worker.js' names the worker.
    chunkNames: 'chunk-[hash]',
    define: { 'import.meta.bundled': 'true' },
    jsx: 'automatic',
    sourcemap: 'linked',
    sourcesContent: false,
    logLevel: 'warning',
    plugins: [externalPackagesPlugin(), sourceUrlPlugin(outdir)],
  });
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const out = process.argv[2] ? resolve(process.argv[2]) : undefined;
  try {
    await buildBundle(out);
  } catch (e) {
    process.stderr.write(`build: ${e.message}\n`);
    process.exitCode = 1;
  }
}
