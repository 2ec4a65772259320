// Q of a run whose plane turns 40°: from the obliquity-corrected amplitudes of two beams, and from one beam alone.
import { describe, expect, it } from 'vitest';
import { fitDamping } from '../../host/analysis/damping.ts';
import { planePasses } from '../../host/analysis/plane-passes.ts';
import { amplitudeFromTransit } from '../../host/analysis/transit-amplitude.ts';
import { planeRun } from './plane-fixtures.ts';

describe('damping when the swing plane turns (issue #16 done-when: Q within 5 %)', () => {
  it('two beams give Q within 5 % of the simulator\'s; beam A alone reads the turning as a different damping', () => {
    const run = planeRun('plane-turns-40deg', 1, 3600);
    const T0 = run.truth.physics.T0_s;
    const qTrue = run.truth.physics.linear_q;
    const passes = planePasses(run.A, run.B, run.geometry, run.periodGuess).passes.filter((p) => !p.flag);
    // The plane really turns by about 40° over the run.
    const turn = Math.abs(passes[passes.length - 1]!.azimuth - passes[0]!.azimuth) * (180 / Math.PI);
    expect(turn).toBeGreaterThan(35);
    const two = fitDamping(
      passes.map((p) => p.t),
      passes.map((p) => p.amplitude),
      T0,
    )!;
    expect(Math.abs(two.Q / qTrue - 1)).toBeLessThan(0.05);

    // One beam (normal at +45°): the slant falls from 65° to 25° over the run, so its amplitudes read far low at
    // first and less low later, which hides half the decay (Q about doubles).
    const phiB = Math.asin(run.geometry.flagWidth / (2 * run.geometry.length));
    const one = fitDamping(
      run.A.map((b) => (b.start + b.end) / 2),
      run.A.map((b) => amplitudeFromTransit(b.end - b.start, phiB, (2 * Math.PI) / T0)),
      T0,
    )!;
    expect(one.Q / qTrue, `beam A alone reads Q ${one.Q.toFixed(0)}`).toBeGreaterThan(1.5);
  });
});
