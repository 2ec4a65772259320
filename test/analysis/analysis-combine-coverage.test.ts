// Coverage of combine's k = 2 intervals over seeds against the simulator's truth (slow: `npm test` only).
import { describe, expect, it } from 'vitest';
import { combineSession } from './combine-sim.ts';

const SEEDS = 40;

/** How many seeds put the truth inside ± 2u, and the rms of (value − truth)/u (1 when the budget is right). */
function coverage(session: string, pick: (s: ReturnType<typeof combineSession>) => { v: number; u: number; truth: number }): { inside: number; rms: number } {
  let inside = 0;
  let z2 = 0;
  for (let seed = 1; seed <= SEEDS; seed++) {
    const s = combineSession(session, seed);
    if (!s.outcome.ok) throw new Error(s.outcome.error);
    const { v, u, truth } = pick(s);
    if (Math.abs(v - truth) <= 2 * u) inside++;
    z2 += ((v - truth) / u) ** 2;
  }
  return { inside, rms: Math.sqrt(z2 / SEEDS) };
}

describe('combine against the simulator truth, over seeds', () => {
  // With 40 seeds a true 95 % coverage gives ≥ 34 inside with probability 0.99 (binomial).
  it('reversible bar: g within its k = 2 uncertainty in about 95 % of sessions', () => {
    const c = coverage('reversible-bar', (s) => ({ v: s.outcome.ok ? s.outcome.result.g_m_s2 : NaN, u: s.outcome.ok ? s.outcome.result.g_u_m_s2 : NaN, truth: s.truth.g_m_s2 }));
    console.log(`reversible: coverage of g ± 2u ${((100 * c.inside) / SEEDS).toFixed(1)} %, rms z ${c.rms.toFixed(2)}`);
    expect(c.inside).toBeGreaterThanOrEqual(34);
    expect(c.rms).toBeGreaterThan(0.5);
    expect(c.rms).toBeLessThan(1.5);
  }, 600_000);

  it('two lengths: g within its k = 2 uncertainty in about 95 % of sessions', () => {
    const c = coverage('two-length-carbide', (s) => ({ v: s.outcome.ok ? s.outcome.result.g_m_s2 : NaN, u: s.outcome.ok ? s.outcome.result.g_u_m_s2 : NaN, truth: s.truth.g_m_s2 }));
    console.log(`two lengths: coverage of g ± 2u ${((100 * c.inside) / SEEDS).toFixed(1)} %, rms z ${c.rms.toFixed(2)}`);
    expect(c.inside).toBeGreaterThanOrEqual(34);
    expect(c.rms).toBeGreaterThan(0.5);
    expect(c.rms).toBeLessThan(1.5);
  }, 600_000);
});
