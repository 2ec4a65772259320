// The tuning series' crossing (T1 = T2 against the movable mass's position) within its k = 2 uncertainty over seeds,
// against the bar's exact crossing (sim/rigid-bar.ts barCrossing; slow: `npm test` only).
import { describe, expect, it } from 'vitest';
import { coverageOver } from './combine-sim.ts';

describe('tuning series over seeds', () => {
  // The crossing needs no length: its error is the periods' own (statistics and each run's clock calibration), 0.6 µm
  // of mass position on the bundled bar. 40 seeds of 8 journals: with a right u each seed is inside ± 2u with
  // probability 0.9545, and P(≤ 34 of 40 | 0.9545) = 0.9 % (binomial; docs/references.md#ref-coverage-seeds).
  // Measured 5 Dec 2026: 38/40 inside (95 %), rms z 1.00.
  it('the crossing position lies within its k = 2 uncertainty in about 95 % of sessions (docs/references.md#ref-reversible-pendulum)', () => {
    const c = coverageOver('tuning-bar', 40, (s) => ({
      v: s.outcome.result.method === 'reversible' ? s.outcome.result.crossing_position_m! : NaN,
      u: s.outcome.result.method === 'reversible' ? s.outcome.result.crossing_position_u_m! : NaN,
      truth: s.truth.crossing_position_m!,
    }));
    console.log(`tuning series: coverage of the crossing ± 2u ${((100 * c.inside) / 40).toFixed(1)} %, rms z ${c.rms.toFixed(2)}`);
    expect(c.inside).toBeGreaterThanOrEqual(35);
    // rms of 40 unit normals: 1 ± 0.11 (k = 1).
    expect(c.rms).toBeGreaterThan(0.65);
    expect(c.rms).toBeLessThan(1.35);
  }, 900_000);
});
