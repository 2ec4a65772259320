import { describe, expect, it } from 'vitest';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { loadScenario } from '../../sim/index.ts';
import { TestRng } from '../analysis/seeded-rng.ts';
import { simAndAnalyze } from './sim-run.ts';

describe('live and batch give the same numbers', () => {
  it('interleaving live() and result() calls never changes the final result', () => {
    const sc = loadScenario('night-run-faults');
    const { entries, result: batch } = simAndAnalyze(sc, { seed: 3, durationS: 1200 });
    const rng = new TestRng(8);
    const p = createRunPipeline();
    let snapshots = 0;
    for (const e of entries) {
      p.push(e);
      if (rng.uniform() < 0.002) {
        p.live();
        p.result();
        snapshots++;
      }
    }
    expect(snapshots).toBeGreaterThan(5);
    expect(p.result()).toEqual(batch);
  });

  it('a partial result at any point equals the batch analysis of the entries so far', () => {
    const sc = loadScenario('demo-low-q');
    const { entries } = simAndAnalyze(sc, { seed: 1, durationS: 300 });
    const p = createRunPipeline();
    const cut = Math.floor(entries.length * 0.6);
    entries.slice(0, cut).forEach((e) => p.push(e));
    expect(p.result()).toEqual(analyzeEntries(entries.slice(0, cut)));
  });

  it('live() reports the latest swing and the heartbeat age at a given moment', () => {
    const sc = loadScenario('demo-low-q');
    const { entries, result } = simAndAnalyze(sc, { seed: 2, durationS: 200 });
    const p = createRunPipeline();
    entries.forEach((e) => p.push(e));
    const l = p.live();
    expect(l.hello?.fw).toBe(result.run.firmware);
    expect(l.passes).toBeGreaterThan(100);
    expect(l.periodS!).toBeCloseTo(l.halfPeriodsS[0]! + l.halfPeriodsS[1]!, 12);
    expect(Math.abs(l.periodS! / result.swings.at(-1)!.period_s! - 1)).toBeLessThan(1e-3);
    expect(l.recent.t_s.length).toBeGreaterThan(50);
    expect(p.live(l.lastHostUs! + 5e6).heartbeatAgeS!).toBeGreaterThan(4);
  });
});
