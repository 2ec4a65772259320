// `npm run test:quick`: the pure core (analysis, pipeline), the protocol and the simulator, for the edit loop.
// Tests that need the firmware toolchain, a pty or socat stay out; `npm test` (what CI runs) runs everything.
import { defineConfig } from 'vitest/config';
import base from './vitest.config.ts';

export default defineConfig({
  ...base,
  test: {
    ...base.test,
    include: ['test/{protocol,analysis,pipeline,sim,reference}/**/*.test.ts'],
    exclude: ['test/sim/sim-emulator.test.ts', 'test/sim/sim-pty.test.ts'],
    // No firmware build: a firmware test that lands in these folders shows as skipped here and runs in `npm test`.
    globalSetup: ['test/setup/quick-setup.ts'],
  },
});
