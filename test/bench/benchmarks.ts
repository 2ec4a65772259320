// The benchmarks in the order `npm run bench` runs them.
import type { Benchmark } from './benchmark.ts';
import { estimator } from './estimator.ts';
import { firmwareTiming } from './firmware-timing.ts';
import { handTiming } from './hand-timing.ts';
import { combineBench } from './combine.ts';
import { ingest } from './ingest.ts';
import { live } from './live.ts';
import { simulatorSpeed } from './simulator-speed.ts';
import { startup } from './startup.ts';

export const BENCHMARKS: readonly Benchmark[] = [startup, ingest, live, simulatorSpeed, firmwareTiming, estimator, handTiming, combineBench];
