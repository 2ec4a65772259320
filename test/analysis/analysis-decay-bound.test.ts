// A run without measurable decay is told so, with the Q it rules out (docs/references.md#ref-damping: A ∝ e^{−γt},
// Q = ω0/(2γ)), instead of "too few swings" with hundreds of passes.
import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { decayBound } from '../../host/analysis/decay-bound.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { scenario, simAndAnalyze } from '../pipeline/sim-run.ts';
import { TestRng } from './seeded-rng.ts';

describe('decayBound', () => {
  it('covers the true Q of exponential decays with noise in at least 95 % of 400 seeds (a one-sided two-u bound)', () => {
    const T0 = 2;
    const Q = 20000;
    let covered = 0;
    for (let seed = 1; seed <= 400; seed++) {
      const rng = new TestRng(seed);
      const t = Array.from({ length: 300 }, (_, i) => i);
      const a = t.map((s) => 0.1 * Math.exp((-Math.PI * s) / (Q * T0)) * (1 + 1e-4 * rng.normal()));
      const b = decayBound(t, a, T0)!;
      if (b.qLower <= Q) covered++;
    }
    expect(covered / 400).toBeGreaterThanOrEqual(0.95);
  });

  it('with constant amplitudes bounds Q from below by a large number, and gives the range', () => {
    const t = Array.from({ length: 100 }, (_, i) => i);
    const a = t.map((i) => 0.5 + (i % 2 ? 1e-6 : -1e-6));
    const b = decayBound(t, a, 2)!;
    expect(b.qLower).toBeGreaterThan(1e4);
    expect(b.aMin).toBeCloseTo(0.5 - 1e-6, 12);
    expect(b.aMax).toBeCloseTo(0.5 + 1e-6, 12);
    expect(b.measurable).toBe(false);
  });

  it('calls a decay measurable only beyond two standard uncertainties of the slope and the numerical resolution', () => {
    const t = Array.from({ length: 300 }, (_, i) => i);
    const rng = new TestRng(7);
    // Q = 2e4 at T0 = 2 s: ln A falls by 0.024 over 300 s, noise 1e-4 per point: far beyond 2u.
    expect(decayBound(t, t.map((s) => 0.1 * Math.exp((-Math.PI * s) / 4e4) * (1 + 1e-4 * rng.normal())), 2)!.measurable).toBe(true);
    // A fall of 1e-12 in ln A with no noise has a tiny u, but is below the amplitudes' resolution.
    expect(decayBound(t, t.map((s) => 0.1 * Math.exp(-1e-12 * (s / 300))), 2)!.measurable).toBe(false);
  });
});

describe('an undamped run', () => {
  it('says there is no measurable decay, with a Q bound and the amplitude range, not "too few swings"', () => {
    const { lines } = simulateJournal(loadScenario('ideal-60deg'), { seed: 1 });
    const r = analyzeEntries([...lines].map(parseJournalLine));
    expect(r.passes).toBeGreaterThan(40);
    expect(r.Q).toBeNull();
    const w = r.warnings.map(warningText).find((x) => /decay/.test(x)) ?? '';
    expect(w).toMatch(/^no measurable decay over the run \(amplitude 60\.0\d° to 60\.0\d°\): Q > \d/);
    expect(r.warnings.map(warningText).join('\n')).not.toMatch(/too few swings/);
  });

  it('with sensor jitter: Q is above a bound, not a number of noise (it read Q = 3.9e6 ± 1.6e6 before)', () => {
    // No damping in the simulated physics (sim/scenario.ts: no linear_q, quadratic or Coulomb term): the true Q is infinite.
    const sc = scenario({ name: 'undamped', rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 }, duration_s: 600, physics: { g_m_s2: 9.80665, release_deg: 10 } });
    const { result: r } = simAndAnalyze(sc, { seed: 3 });
    expect(r.Q).toBeNull();
    expect(r.Q_u).toBeNull();
    expect(r.Q_lower_bound!).toBeGreaterThan(1e6);
    expect(r.warnings.map(warningText).join('\n')).toMatch(/no measurable decay over the run \(amplitude 10\.00° to 10\.00°\): Q > /);
  });

  it('a weakly damped run keeps its fitted Q (true Q 20 000 within 3 standard uncertainties)', () => {
    const sc = scenario({ name: 'q20k', rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 }, duration_s: 900, physics: { g_m_s2: 9.80665, release_deg: 10, linear_q: 20000 } });
    const { result: r } = simAndAnalyze(sc, { seed: 3 });
    expect(r.Q_lower_bound).toBeNull();
    expect(Math.abs(r.Q! - 20000)).toBeLessThan(3 * r.Q_u!);
  });
});
