// The swing plane pass by pass: pairs the two beams' blocked intervals and solves each pair for the ellipse.
import { periodRatio } from './elliptic.ts';
import { median } from './stats.ts';
import { solvePass, type TwoBeamGeometry } from './two-beam-geometry.ts';
import { transitTime } from './transit-amplitude.ts';

/** A beam's blocked interval, seconds on the run's timebase. */
export interface Blocked {
  readonly start: number;
  readonly end: number;
}

/** One pass seen by both beams. */
export interface PlanePass {
  /** Index of the pass in beam A's intervals. */
  readonly index: number;
  /** Mean of the two mid-crossings (≈ the closest approach). */
  readonly t: number;
  /** Axis direction (rad) in the sector between the beam lines that holds the reference direction; NaN if unsolved. */
  readonly azimuth: number;
  /** Semi-major axis (m) and its angle θ0 = 2 asin(a/2L) (rad); NaN when flagged. */
  readonly a: number;
  readonly amplitude: number;
  /** Signed semi-minor axis (m), + counterclockwise from above; NaN when flagged. */
  readonly b: number;
  /** The transit a single beam crossed squarely would have seen (s): the obliquity-corrected speed as a time. */
  readonly squareTransit: number;
  /** Why the pass is not measured (near a beam line, or a transit no swing gives), else undefined. */
  readonly flag?: string;
}

const mid = (x: Blocked): number => (x.start + x.end) / 2;

/** Pairs each interval of A (by index) with the interval of B whose middle is nearest and within a quarter period; others are left out. */
export function pairBeams(A: readonly Blocked[], B: readonly Blocked[], periodS: number): [number, Blocked, Blocked][] {
  const out: [number, Blocked, Blocked][] = [];
  let j = 0;
  A.forEach((a, i) => {
    const m = mid(a);
    while (j + 1 < B.length && Math.abs(mid(B[j + 1]!) - m) <= Math.abs(mid(B[j]!) - m)) j++;
    const b = B[j];
    if (b && Math.abs(mid(b) - m) < periodS / 4) out.push([i, a, b]);
  });
  return out;
}

/** Full period from the paired passes: twice the median spacing of consecutive pass times. */
function periodFrom(pairs: readonly [number, Blocked, Blocked][]): number {
  const d: number[] = [];
  for (let i = 1; i < pairs.length; i++) if (pairs[i]![0] === pairs[i - 1]![0] + 1) d.push(mid(pairs[i]![1]) - mid(pairs[i - 1]![1]));
  return 2 * median(d);
}

/**
 * Every paired pass solved. ω0 = 2π/T0 comes from the median period reduced to zero amplitude with the median
 * amplitude (two rounds: the amplitude needs ω0 and the reduction needs the amplitude); its error moves the
 * azimuth and b only at second order.
 */
export function planePasses(
  A: readonly Blocked[],
  B: readonly Blocked[],
  g: Omit<TwoBeamGeometry, 'omega0'>,
  periodGuessS: number,
): { passes: PlanePass[]; omega0: number } {
  const pairs = pairBeams(A, B, periodGuessS);
  if (pairs.length < 3) return { passes: [], omega0: NaN };
  const T = periodFrom(pairs);
  let omega0 = (2 * Math.PI) / T;
  let passes: PlanePass[] = [];
  for (let round = 0; round < 2; round++) {
    passes = pairs.map(([i, a, b]) => solveOne(i, a, b, { ...g, omega0 }));
    const amp = median(passes.map((p) => p.amplitude).filter(Number.isFinite));
    if (Number.isFinite(amp)) omega0 = ((2 * Math.PI) / T) * periodRatio(amp);
  }
  return { passes, omega0 };
}

function solveOne(index: number, a: Blocked, b: Blocked, g: TwoBeamGeometry): PlanePass {
  const fix = solvePass({ transit: a.end - a.start, mid: mid(a) }, { transit: b.end - b.start, mid: mid(b) }, g);
  const t = (mid(a) + mid(b)) / 2;
  if (!fix.ok) return { index, t, azimuth: fix.azimuth, a: NaN, amplitude: NaN, b: NaN, squareTransit: NaN, flag: fix.reason };
  const amplitude = 2 * Math.asin(Math.min(1, fix.a / (2 * g.length)));
  const squareTransit = transitTime(amplitude, Math.asin(Math.min(1, g.flagWidth / (2 * g.length))), g.omega0);
  return { index, t, azimuth: fix.azimuth, a: fix.a, amplitude, b: fix.b, squareTransit };
}
