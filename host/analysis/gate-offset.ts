// Gate offset from the alternation of half-periods: where the beam sits relative to the lowest point.
//
// With the beam an angle δ from equilibrium, the half-period spent beyond the beam on the side it leans to is
// shorter by 4∫₀^δ dθ/θ' ≈ 4δ/Ω, where Ω = 2ω0 sin(θ0/2) is the angular speed at the bottom (exact energy law;
// reference-values §2b: T/2 ± 2 asin(δ/θ0)/ω in the harmonic limit). Pass 0 is the first pass of a segment; the
// half-period starting at an even pass is spent on the side opposite to where the bob was before pass 0, so
// δ (toward that earlier side) = (Ω/4)·(h_even − h_odd), estimated for every pass that has both neighbours.
import { batchMeansStdError } from './stats.ts';

/** Per-pass inputs: pass number within its segment, segment, time (s), amplitude (rad); rejected passes have index −1. */
export interface GatePasses {
  readonly index: ArrayLike<number>;
  readonly segment: ArrayLike<number>;
  readonly t: ArrayLike<number>;
  readonly amplitude: ArrayLike<number>;
}

/** Gate offset as an angle from the lowest point (rad) with its standard uncertainty. */
export interface GateOffset {
  readonly delta_rad: number;
  readonly delta_u_rad: number;
  readonly samples: number;
  /** Segments after the first whose alternation sign was aligned to the first (their side is not known). */
  readonly alignedSegments: number;
  /** Per-sample half-period difference (long minus short by parity) for plots. */
  readonly series: { readonly t_s: number[]; readonly diff_s: number[] };
}

/** Estimates the gate offset; null with fewer than 4 usable passes. */
export function gateOffset(p: GatePasses, omega0: number): GateOffset | null {
  const perSeg = new Map<number, { d: number[]; t: number[]; diff: number[] }>();
  const n = p.index.length;
  // prev[k] = position of the previous valid pass, so neighbours are found in O(1).
  let a = -1;
  let b = -1;
  for (let c = 0; c < n; c++) {
    if (p.index[c]! < 0) continue;
    if (a >= 0 && b >= 0 && p.segment[a] === p.segment[c] && p.index[b]! === p.index[a]! + 1 && p.index[c]! === p.index[b]! + 1) {
      const h1 = p.t[b]! - p.t[a]!;
      const h2 = p.t[c]! - p.t[b]!;
      const th = p.amplitude[b]!;
      if (Number.isFinite(th)) {
        const evenFirst = p.index[a]! % 2 === 0;
        const diff = evenFirst ? h1 - h2 : h2 - h1;
        const omegaBottom = 2 * omega0 * Math.sin(th / 2);
        let s = perSeg.get(p.segment[c]!);
        if (!s) perSeg.set(p.segment[c]!, (s = { d: [], t: [], diff: [] }));
        s.d.push((omegaBottom / 4) * diff);
        s.t.push(p.t[b]!);
        s.diff.push(diff);
      }
    }
    a = b;
    b = c;
  }
  const segs = [...perSeg.keys()].sort((x, y) => x - y);
  if (segs.length === 0) return null;
  const mean = (v: number[]): number => v.reduce((s, x) => s + x, 0) / v.length;
  const ref = Math.sign(mean(perSeg.get(segs[0]!)!.d)) || 1;
  const all: number[] = [];
  const ts: number[] = [];
  const diffs: number[] = [];
  let aligned = 0;
  for (const k of segs) {
    const s = perSeg.get(k)!;
    const flip = k !== segs[0] && Math.sign(mean(s.d)) !== ref ? -1 : 1;
    if (k !== segs[0]) aligned++;
    for (let i = 0; i < s.d.length; i++) {
      all.push(flip * s.d[i]!);
      ts.push(s.t[i]!);
      diffs.push(flip * s.diff[i]!);
    }
  }
  if (all.length < 4) return null;
  return { delta_rad: mean(all), delta_u_rad: batchMeansStdError(all), samples: all.length, alignedSegments: aligned, series: { t_s: ts, diff_s: diffs } };
}
