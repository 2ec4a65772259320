// `npm run test:quick`: the pure core (analysis, pipeline, output formatting), the protocol and the simulator,
// for the edit loop.
// Left to `npm test` (what CI runs): tests that need the firmware toolchain, a pty or socat; every multi-seed
// coverage test (named *-coverage.test.ts, by convention); and the few heavy end-to-end files listed below.
import { defineConfig } from 'vitest/config';
import base from './vitest.config.ts';

export default defineConfig({
  ...base,
  test: {
    ...base.test,
    include: ['test/{protocol,analysis,pipeline,output,sim,reference}/**/*.test.ts'],
    exclude: [
      '**/*-coverage.test.ts',
      'test/sim/sim-emulator.test.ts',
      'test/sim/sim-pty.test.ts',
      // Hours of simulated run each (the live-vs-full sweep runs every scenario, a night among them), or the
      // CLI as child processes through tsx.
      'test/sim/sim-determinism.test.ts',
      'test/pipeline/pipeline-live-estimate.test.ts',
      'test/pipeline/pipeline-fault-counts.test.ts',
      'test/analysis/analysis-plane-passes.test.ts',
      'test/analysis/analysis-room-drift.test.ts',
      'test/analysis/analysis-cli-*.test.ts',
    ],
    // Worker threads that keep the module cache from file to file: these files share no global state, and
    // importing the analysis afresh in a fork per file took 3× the time of the tests themselves.
    pool: 'threads',
    isolate: false,
    // No firmware build: a firmware test that lands in these folders shows as skipped here and runs in `npm test`.
    globalSetup: ['test/setup/quick-setup.ts'],
  },
});
