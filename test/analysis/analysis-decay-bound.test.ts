// A run without measurable decay is told so, with the Q it rules out (docs/references.md#ref-damping: A ∝ e^{−γt},
// Q = ω0/(2γ)), instead of "too few swings" with hundreds of passes.
import { describe, expect, it } from 'vitest';
import { decayBound } from '../../host/analysis/decay-bound.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
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
  });
});

describe('an undamped run', () => {
  it('says there is no measurable decay, with a Q bound and the amplitude range, not "too few swings"', () => {
    const { lines } = simulateJournal(loadScenario('ideal-60deg'), { seed: 1 });
    const r = analyzeEntries([...lines].map(parseJournalLine));
    expect(r.passes).toBeGreaterThan(40);
    expect(r.Q).toBeNull();
    const w = r.warnings.find((x) => /decay/.test(x)) ?? '';
    expect(w).toMatch(/^no measurable decay over the run \(amplitude 60\.00° to 60\.00°\): Q > \d/);
    expect(r.warnings.join('\n')).not.toMatch(/too few swings/);
  });
});
