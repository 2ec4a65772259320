// Gate offset from the alternation of half-periods: where the beam sits relative to the lowest point.
//
// With the beam a horizontal distance x0 from the lowest point, the flag (width w, radius L) blocks it between the
// angles e± = asin((x0 ± w/2)/L). Passing the bottom at time 0, the bob's mid-transit time is
// m = [t(e+) + t(e−)]/2 with t(θ) the exact time from the bottom to θ (energy law, t(θ) = F(asin(sin(θ/2)/k)|k²)/ω0,
// k = sin(θ0/2)), so the half-period on the side the beam leans to is T/2 − 2m and the other T/2 + 2m: their
// difference D = 4m (docs/references.md#ref-gate-offset gives T/2 ± 2 asin(δ/θ0)/ω in the harmonic limit). We solve m(x0) = D/4
// for x0 by Newton's method. The simple δ = Ω·D/4 (Ω the bottom angular speed) overestimates |x0| by about
// φb²/(2θ0²), 3 % at 3° for a 25 mm ball on 1 m, because the midpoint of a transit is not the time at its centre.
// Pass 0 is the first pass of a segment; the half-period starting at an even pass is spent on the side opposite
// to where the bob was before pass 0, so x0 (toward that earlier side) comes from D = h_even − h_odd.
import { ellipticF } from './elliptic.ts';
import { batchMeansStdError } from './stats.ts';
import { blockHalfAngle } from './transit-amplitude.ts';

/** Per-pass inputs: pass number within its segment, segment, time (s), amplitude (rad); rejected passes have index −1. */
export interface GatePasses {
  readonly index: ArrayLike<number>;
  readonly segment: ArrayLike<number>;
  readonly t: ArrayLike<number>;
  readonly amplitude: ArrayLike<number>;
  /** Times for the plot series (default `t`), e.g. journal time when `t` is device time. */
  readonly tPlot?: ArrayLike<number>;
}

/** Exact time (s) from the bottom to angle θ (|θ| < θ0) for amplitude θ0, ω0 = 2π/T0. */
export function timeFromBottom(theta: number, theta0: number, omega0: number): number {
  const k = Math.sin(0.5 * theta0);
  const x = Math.min(1, Math.abs(Math.sin(0.5 * theta)) / k);
  return (Math.sign(theta) * ellipticF(Math.asin(x), k * k)) / omega0;
}

/** The beam's horizontal offset x0 (m) that makes consecutive half-periods differ by D (s), at amplitude θ0. */
export function offsetFromAlternation(diffS: number, theta0: number, omega0: number, widthM: number, lengthM: number): number {
  const k = Math.sin(0.5 * theta0);
  const half = widthM / 2;
  // m(x0) is odd in x0: start from its slope at 0, then Newton on the exact m (two steps reach ~1e-12 m).
  const e0 = Math.asin(half / lengthM);
  let x0 = diffS / 4 / (1 / (bottomSpeed(e0, k, omega0) * lengthM * Math.cos(e0)));
  for (let i = 0; i < 20; i++) {
    const ep = Math.asin(Math.max(-1, Math.min(1, (x0 + half) / lengthM)));
    const em = Math.asin(Math.max(-1, Math.min(1, (x0 - half) / lengthM)));
    const m = 0.5 * (timeFromBottom(ep, theta0, omega0) + timeFromBottom(em, theta0, omega0));
    const dm = 0.5 * (1 / (bottomSpeed(ep, k, omega0) * lengthM * Math.cos(ep)) + 1 / (bottomSpeed(em, k, omega0) * lengthM * Math.cos(em)));
    const step = (m - diffS / 4) / dm;
    x0 -= step;
    if (!Number.isFinite(x0)) return NaN;
    if (Math.abs(step) < 1e-12) break;
  }
  return x0;
}

/** d(mid-transit time)/d(gate offset) at zero offset, s per metre: the alternation per metre of offset, halved. */
export function midShiftPerMetre(theta0: number, omega0: number, widthM: number, lengthM: number): number {
  const e0 = Math.asin(Math.min(1, widthM / 2 / lengthM));
  return 1 / (bottomSpeed(e0, Math.sin(0.5 * theta0), omega0) * lengthM * Math.cos(e0));
}

/** Angular speed θ' at angle e for amplitude sin(θ0/2) = k (energy law). */
function bottomSpeed(e: number, k: number, omega0: number): number {
  return 2 * omega0 * Math.sqrt(Math.max(1e-300, k * k - Math.sin(0.5 * e) ** 2));
}

/** Gate offset from the lowest point (m), with its standard uncertainty. */
export interface GateOffset {
  readonly offset_m: number;
  readonly offset_u_m: number;
  readonly samples: number;
  /** Segments after the first whose alternation sign was aligned to the first (their side is not known). */
  readonly alignedSegments: number;
  /** Per-sample half-period difference (long minus short by parity) for plots. */
  readonly series: { readonly t_s: number[]; readonly diff_s: number[] };
}

/** Estimates the gate offset; null with fewer than 4 usable passes. */
export function gateOffset(p: GatePasses, omega0: number, widthM: number, lengthM: number): GateOffset | null {
  const phiB = blockHalfAngle(widthM, lengthM);
  const perSeg = new Map<number, { d: number[]; t: number[]; diff: number[] }>();
  const n = p.index.length;
  // a, b: the two valid passes before c.
  let a = -1;
  let b = -1;
  for (let c = 0; c < n; c++) {
    if (p.index[c]! < 0) continue;
    if (a >= 0 && b >= 0 && p.segment[a] === p.segment[c] && p.index[b]! === p.index[a]! + 1 && p.index[c]! === p.index[b]! + 1) {
      const h1 = p.t[b]! - p.t[a]!;
      const h2 = p.t[c]! - p.t[b]!;
      const th = p.amplitude[b]!;
      if (Number.isFinite(th) && th > phiB) {
        const evenFirst = p.index[a]! % 2 === 0;
        const diff = evenFirst ? h1 - h2 : h2 - h1;
        let s = perSeg.get(p.segment[c]!);
        if (!s) perSeg.set(p.segment[c]!, (s = { d: [], t: [], diff: [] }));
        s.d.push(offsetFromAlternation(diff, th, omega0, widthM, lengthM));
        s.t.push((p.tPlot ?? p.t)[b]!);
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
  return { offset_m: mean(all), offset_u_m: batchMeansStdError(all), samples: all.length, alignedSegments: aligned, series: { t_s: ts, diff_s: diffs } };
}
