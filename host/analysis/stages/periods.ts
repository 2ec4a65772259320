// Stage: numbered passes → half-periods and full periods, with the passes too slow to time a period marked.
import type { SequencedPasses } from '../passes.ts';
import { everyKth, median } from '../stats.ts';

/** Half-periods and full periods, parallel to the passes (NaN / −1 where there is none), and the usable periods. */
export interface Periods {
  readonly half: Float64Array;
  /** Full period ending at each pass, from the pass two numbers back (so a gate offset cancels to first order). */
  readonly period: Float64Array;
  /** The pass that starts each period, and the one in its middle (−1 when that one is missing). */
  readonly start: Int32Array;
  readonly mid: Int32Array;
  /** Valid passes (numbered by the sequencing). */
  readonly validCount: number;
  /** 1 for a pass that barely clears the beam: amplitudes only (see `markSlow`). */
  readonly slow: Uint8Array;
  readonly slowCount: number;
  /** The passes that end a usable period, in time order, and those periods (s). */
  readonly ends: Int32Array;
  readonly P: Float64Array;
}

/** Half-periods and full periods from the pass numbers of each segment. */
function intervals(p: SequencedPasses): Pick<Periods, 'half' | 'period' | 'start' | 'mid' | 'validCount'> {
  const n = p.t.length;
  const half = new Float64Array(n).fill(NaN);
  const period = new Float64Array(n).fill(NaN);
  const start = new Int32Array(n).fill(-1);
  const mid = new Int32Array(n).fill(-1);
  let prev1 = -1;
  let prev2 = -1;
  let validCount = 0;
  for (let c = 0; c < n; c++) {
    if (p.index[c]! < 0) continue;
    validCount++;
    const idx = p.index[c]!;
    if (prev1 >= 0 && p.segment[prev1] !== p.segment[c]) prev1 = prev2 = -1;
    if (prev2 >= 0 && p.segment[prev2] !== p.segment[c]) prev2 = -1;
    if (prev1 >= 0 && p.index[prev1] === idx - 1) half[c] = p.td[c]! - p.td[prev1]!;
    const a = prev1 >= 0 && p.index[prev1] === idx - 2 ? prev1 : prev2 >= 0 && p.index[prev2] === idx - 2 ? prev2 : -1;
    if (a >= 0) {
      period[c] = p.td[c]! - p.td[a]!;
      start[c] = a;
      mid[c] = prev1 >= 0 && p.index[prev1] === idx - 1 ? prev1 : -1;
    }
    prev2 = prev1;
    prev1 = c;
  }
  return { half, period, start, mid, validCount };
}

/**
 * A swing that barely clears the beam (transit over a third of the half-period, amplitude below ~2φb) has a
 * mid-transit time that moves with the amplitude and the gate offset far more than a period's noise: such passes
 * give amplitudes but no periods (their periods become NaN) and no gate offset.
 */
function markSlow(p: SequencedPasses, half: Float64Array, period: Float64Array, start: Int32Array): { slow: Uint8Array; slowCount: number } {
  const n = p.t.length;
  const medHalf = median(everyKth(half, 4000));
  const slow = new Uint8Array(n);
  let slowCount = 0;
  for (let c = 0; c < n; c++) if (p.index[c]! >= 0 && p.transit[c]! > medHalf / 3) (slow[c] = 1), slowCount++;
  for (let c = 0; c < n; c++) if (Number.isFinite(period[c]!) && (slow[c] || slow[start[c]!])) period[c] = NaN;
  return { slow, slowCount };
}

/** The periods stage. */
export function findPeriods(p: SequencedPasses): Periods {
  const iv = intervals(p);
  const { slow, slowCount } = markSlow(p, iv.half, iv.period, iv.start);
  // Counted first and filled in place: a week has ~300 000 periods, and typed-array `from` over an iterable
  // builds a boxed copy of every element first.
  let count = 0;
  for (let c = 0; c < iv.period.length; c++) if (Number.isFinite(iv.period[c]!)) count++;
  const ends = new Int32Array(count);
  const P = new Float64Array(count);
  for (let c = 0, k = 0; c < iv.period.length; c++) if (Number.isFinite(iv.period[c]!)) (ends[k] = c), (P[k++] = iv.period[c]!);
  return { ...iv, slow, slowCount, ends, P };
}
