// Stage: the final T0, a line through the amplitude-reduced pass times (t0-line-fit.ts).
import type { Rig } from '../../../protocol/rig.ts';
import { midShiftPerMetre } from '../gate-offset.ts';
import type { SequencedPasses } from '../passes.ts';
import { fitT0Line, type T0Line } from '../t0-line-fit.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

/** T0 (s) with the line that gave it (null when the line could not be fitted: T0 is then the mean of periods). */
export interface T0Estimate {
  readonly T0: number | null;
  readonly line: T0Line | null;
}

/**
 * The line is far more efficient than the mean of the reduced periods, which stays for the per-swing table and the
 * running g. The fixed point of the reduction used the mean; the two differ by far less than the amplitude's
 * sensitivity to ω0 could feel. Slow passes (see periods.ts) are left out.
 */
export function lineT0(p: SequencedPasses, per: Periods, red: Reduction, rig: Rig | null, range?: readonly [number, number]): T0Estimate {
  if (red.T0mean === null) return { T0: null, line: null };
  // A range of passes (a block of the run, stages/environment.ts) is fitted on its own.
  const [lo, hi] = range ?? [0, p.t.length];
  const cut = (a: ArrayLike<number>): ArrayLike<number> => (range ? Array.from({ length: hi - lo }, (_, i) => a[lo + i]!) : a);
  const n = hi - lo;
  const use = new Uint8Array(n);
  for (let c = 0; c < n; c++) use[c] = p.index[lo + c]! >= 0 && !per.slow[lo + c] ? 1 : 0;
  const omega0m = (2 * Math.PI) / red.T0mean;
  const line = fitT0Line(
    { index: cut(p.index), segment: cut(p.segment), t: cut(p.td), amplitude: rig ? cut(red.amp) : new Float64Array(n), use },
    rig ? (th: number) => midShiftPerMetre(th, omega0m, rig.flag_width_m, rig.length_m) : null,
  );
  return { T0: line && Number.isFinite(line.T0) ? line.T0 : red.T0mean, line };
}
