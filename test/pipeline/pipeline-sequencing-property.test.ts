import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { buildJournal, passEdges, type Edge } from './journal-builder.ts';

const H = 1.0032;
const TAU = 0.04;

describe('pass sequencing under random missing passes and objects (property)', () => {
  it('never reports a wrong period, bridges every short gap and rejects every object', () => {
    fc.assert(
      fc.property(
        fc.uniqueArray(fc.integer({ min: 5, max: 115 }), { maxLength: 8 }),
        fc.array(fc.record({ at: fc.double({ min: 10, max: 110, noNaN: true }), dur: fc.double({ min: 0.005, max: 0.3, noNaN: true }) }), { maxLength: 5 }),
        (gapStarts, objects) => {
          // Gaps of one or two missing passes, at least four passes apart.
          const missing = new Set<number>();
          const starts = [...gapStarts].sort((a, b) => a - b).filter((g, i, a) => i === 0 || g - a[i - 1]! > 4);
          starts.forEach((g, i) => {
            missing.add(g);
            if (i % 2) missing.add(g + 1);
          });
          const mids = Array.from({ length: 120 }, (_, k) => 2 + k * H).filter((_, k) => !missing.has(k));
          // Objects kept clear of the bob's transits (else they merge with one; that case has its own test).
          const objs = objects.filter((o) => Array.from({ length: 120 }, (_, k) => 2 + k * H).every((m) => o.at > m + TAU / 2 + 0.05 || o.at + o.dur < m - TAU / 2 - 0.05));
          const clear = objs.filter((o, i) => objs.every((q, j) => j === i || o.at > q.at + q.dur + 0.01 || o.at + o.dur < q.at - 0.01));
          const edges: Edge[] = [...passEdges(mids, TAU), ...clear.flatMap((o) => [{ t: o.at, edge: 'f' as const }, { t: o.at + o.dur, edge: 'r' as const }])];
          const r = analyzeEntries(buildJournal({ edges: edges.sort((a, b) => a.t - b.t), durationS: 125 }).entries, { clock: 'nominal' });
          for (const s of r.swings) if (s.period_s !== null) expect(Math.abs(s.period_s - 2 * H)).toBeLessThan(1e-5);
          expect(r.counts.bridged_gaps).toBe(starts.length);
          expect(r.counts.rejected_passes).toBe(clear.length);
          expect(r.passes).toBe(mids.length);
        },
      ),
      { numRuns: 40 },
    );
  });
});
