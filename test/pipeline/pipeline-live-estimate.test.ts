// The live estimate (host/pipeline/live-estimator.ts) against the full result of the same moment, on every bundled
// scenario at several points of the run and at its end. The full result is the truth here: the live state must show
// what `analyze` would show for the entries so far. The tolerances are in live-compare.ts; the estimator's header
// says why each difference exists. The live amplitudes use the gate delay of the latest full result, as the live
// view and the recorder pass it: here the result of the same moment is computed first. Every scenario at full
// length (night-run-faults is a night) takes ~30 s: left to `npm test`, out of test:quick.
import { describe, expect, it } from 'vitest';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { listScenarios } from '../../sim/index.ts';
import { compare, comparePlane, entriesOf, feed, POINTS } from './live-compare.ts';

describe('the live state is the full analysis of the newest passes', () => {
  for (const name of listScenarios()) {
    it(`${name} (seed 1): live agrees with the full result at ${POINTS.join(', ')} of the run`, () => {
      const entries = entriesOf(name);
      const p = createRunPipeline();
      let k = 0;
      const plane = { passes: 0, semiMajor: 0 };
      for (const f of POINTS) {
        const cut = Math.floor(entries.length * f);
        feed(p, entries, k, cut);
        k = cut;
        // The result first: live amplitudes use the gate delay it calibrated.
        const r = p.result();
        const l = p.live();
        const { shown } = compare(l, r, `${name} at ${f}`);
        const c = comparePlane(l, r, `${name} at ${f}`);
        plane.passes += c.passes;
        plane.semiMajor += c.semiMajor;
        expect(shown).toBeGreaterThan(0);
      }
      // Every two-beam scenario shows its plane live (a window of 160 passes keeps ~100 measured after the warm-up).
      if (name.startsWith('plane-')) {
        expect(plane.passes, `${name}: plane passes compared`).toBeGreaterThan(100);
        expect(plane.semiMajor, `${name}: semi-major axes compared`).toBeGreaterThan(50);
      }
    }, 120_000);
  }
});
