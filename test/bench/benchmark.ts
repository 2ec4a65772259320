// What every benchmark module provides, the context it runs in, and loading of parts that may not have landed.
import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { FigureResult } from './report.ts';

/** The repository root (two folders above this file). */
export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

export interface BenchContext {
  /** Tiny sizes, for the smoke test: the numbers mean nothing then. */
  readonly quick: boolean;
  /** A scratch folder for this run, removed afterwards. */
  readonly workDir: string;
  /** Prints one progress line (to stderr, so `--json` output stays clean). */
  progress(msg: string): void;
}

export interface Benchmark {
  /** Short name for `--only`. */
  readonly id: string;
  readonly title: string;
  run(ctx: BenchContext): Promise<FigureResult>;
}

/** Thrown by a benchmark when a part it needs is missing; the runner reports the figure as not measured. */
export class NotMeasured extends Error {}

/**
 * Imports a module of the repository by its path from the root, or throws NotMeasured naming it. Parts are
 * built concurrently by others, so the benchmarks load them at run time and say plainly what is missing.
 */
export async function importPart<T>(relPath: string, needs: readonly string[] = []): Promise<T> {
  const file = join(REPO_ROOT, relPath);
  if (!existsSync(file)) throw new NotMeasured(`${relPath} has not landed`);
  const mod = (await import(pathToFileURL(file).href)) as Record<string, unknown>;
  for (const name of needs) if (mod[name] === undefined) throw new NotMeasured(`${relPath} does not export ${name}`);
  return mod as T;
}
