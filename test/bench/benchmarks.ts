// The benchmarks in the order `npm run bench` runs them.
import type { Benchmark } from './benchmark.ts';
import { firmwareTiming } from './firmware-timing.ts';
import { ingest } from './ingest.ts';

export const BENCHMARKS: readonly Benchmark[] = [ingest, firmwareTiming];
