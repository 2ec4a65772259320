// Coverage of combine's k = 2 intervals over seeds against the simulator's truth, with the rig as measured
// (sim/measured-rig.ts: every rig value with a stated u drawn about the truth, what the runs share drawn once per
// session), so that each input term of the budget is exercised. Slow: `npm test` only.
//
// Thresholds are binomial: with a right budget each seed is inside ± 2u with probability 0.9545 (normal errors), and the
// bound is the count that a right budget misses with probability < 1 % (binomial lower tail; docs/references.md#ref-coverage-seeds).
import { describe, expect, it } from 'vitest';
import { coverageOf } from './combine-sim.ts';

describe('combine against the simulator truth, over seeds', () => {
  // g's error here is almost all the session's draw of the l reading (20 µm, 2.0e-5 of g) and of the balance point,
  // both exactly the budget's terms; the flag width and the two flag radii add ~1.6e-6. The l draw alone falls outside
  // 2σ in 11 of seeds 1–100 and 14 of 1–200, so 200 seeds (≈ 40 s on the shared 2-core machine; was 100): P(≤ 181 of 200 inside | 95.45 %) = 0.2 %.
  // Measured 5 Dec 2026: 185/200 inside, rms z 1.04 (seeds 1–100: 88, rms 1.14, as without the measured flag).
  it('reversible bar: g within its k = 2 uncertainty in about 95 % of 200 sessions (docs/references.md#ref-reversible-pendulum)', () => {
    const seeds = 200;
    const { g } = coverageOf('reversible-bar', seeds, { g: (s) => ({ v: s.outcome.result.g_m_s2, u: s.outcome.result.g_u_m_s2, truth: s.truth.g_m_s2 }) }, true);
    console.log(`reversible, rig as measured: g ${g.inside}/${seeds} inside ± 2u, rms z ${g.rms.toFixed(2)}`);
    expect(g.inside).toBeGreaterThanOrEqual(182);
    // rms of 200 unit normals: 1 ± 0.05 (k = 1).
    expect(g.rms).toBeGreaterThan(0.8);
    expect(g.rms).toBeLessThan(1.2);
  }, 900_000);

  // 100 seeds (≈ 35 s; was 40): P(≤ 89 inside | 95.45 %) = 0.6 %. Measured: g 99/100, rms z 0.85; offset 99/100, rms z 0.86.
  // A little wide: the air term's half-range is the largest after the length differences, and the simulator's
  // added mass is one value inside it (the budget is honest, a little safe). The flag width is drawn once (one ball).
  it('two lengths: g and the scale offset within their k = 2 uncertainties in about 95 % of sessions (docs/references.md#ref-two-length)', () => {
    const seeds = 100;
    const c = coverageOf(
      'two-length-carbide',
      seeds,
      {
        g: (s) => ({ v: s.outcome.result.g_m_s2, u: s.outcome.result.g_u_m_s2, truth: s.truth.g_m_s2 }),
        offset: (s) => ({
          v: s.outcome.result.method === 'two-length' ? s.outcome.result.length_offset_m : NaN,
          u: s.outcome.result.method === 'two-length' ? s.outcome.result.length_offset_u_m : NaN,
          truth: s.truth.length_offset_m!,
        }),
      },
      true,
    );
    console.log(`two lengths, rig as measured: g ${c.g.inside}/${seeds}, rms z ${c.g.rms.toFixed(2)}; offset ${c.offset.inside}/${seeds}, rms z ${c.offset.rms.toFixed(2)}`);
    for (const k of ['g', 'offset'] as const) {
      expect(c[k].inside).toBeGreaterThanOrEqual(90);
      // rms of 100 unit normals: 1 ± 0.07 (k = 1); the lower bound catches a budget grossly too wide.
      expect(c[k].rms).toBeGreaterThan(0.6);
      expect(c[k].rms).toBeLessThan(1.25);
    }
  }, 900_000);
});
