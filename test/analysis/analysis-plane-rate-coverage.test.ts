// The swing plane's azimuth rate: its k = 2 interval covers the simulator's true rate over seeds (slow: `npm test` only).
import { describe, expect, it } from 'vitest';
import { planeRates } from './plane-fixtures.ts';

describe('azimuth rate over seeds', () => {
  it('k = 2 interval holds the true rate in 93–97 % of seeds (two noise-limited scenarios, 150 seeds each, 5 min runs)', () => {
    let inside = 0;
    let n = 0;
    for (const name of ['plane-foucault-50n', 'plane-clock-1500ppm']) {
      for (let seed = 1; seed <= 150; seed++) {
        const { m, truth } = planeRates(name, seed, 300);
        if (Math.abs(m.rate - truth) <= 2 * m.u) inside++;
        n++;
      }
    }
    expect(inside / n).toBeGreaterThanOrEqual(0.93);
    expect(inside / n).toBeLessThanOrEqual(0.97);
  }, 120_000);
});
