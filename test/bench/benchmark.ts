// What every benchmark module provides and the context it runs in.
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
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
