// T0 from a straight line through amplitude-reduced pass times: efficient where a mean of periods is not.
//
// A mean of the full periods t_k − t_(k−2) telescopes to its end points, so its error falls as 1/N, while a
// least-squares line through N pass times reaches σ√(12/(N(N² − 1))) (docs/references.md#ref-timing-statistics). The swing is not
// isochronous, so each half-period is first divided by the exact law r(θ) = 2K(sin²(θ/2))/π at its amplitude:
//   τ_k = τ_(k−1) + (t_k − t_(k−1)) / r(θ̄),
// and τ_k = a_seg + k·T0/2 + x_seg·s_k·μ(θ_k)/r(θ_k) + noise, with s_k = ±1 by pass parity and μ the mid-transit
// shift per metre of gate offset (the alternation of docs/references.md#ref-gate-offset grows as the amplitude falls). Amplitudes are smoothed
// over ±8 passes first, so their noise barely reaches τ. The slope comes from the Frisch–Waugh–Lovell form
// (intercept and alternation partialled out per segment). Its uncertainty does not trust the residuals to be
// independent: τ carries white timing noise σ_w and a random walk σ_u. The walk has a known source, the amplitude
// noise carried into each reduced half-period (its size follows from the scatter of the raw amplitudes about the
// smoothed ones), and possibly unknown ones (slow drifts), taken from the residual differences at a long lag when
// they are significant (2σ). Var(β) = σ_w²Σc² + σ_u²ΣC², c the slope's weights on τ and C their tail sums.
import { periodRatio } from './elliptic.ts';

/** Inputs, parallel per pass: pass number within its segment, segment, time (s), amplitude (rad), usable flag. */
export interface LinePasses {
  readonly index: ArrayLike<number>;
  readonly segment: ArrayLike<number>;
  readonly t: ArrayLike<number>;
  readonly amplitude: ArrayLike<number>;
  readonly use: ArrayLike<number>;
}

/** The fitted T0 and the parts of its uncertainty. */
export interface T0Line {
  readonly T0: number;
  readonly u_T0: number;
  readonly passes: number;
  readonly sigmaWhite_s: number;
  readonly sigmaWalk_s: number;
}

const SMOOTH = 8;
const LONG_LAG = 32;

/** Smoothed amplitudes: mean over ±SMOOTH usable passes of the same segment (NaN where unusable). */
export function smoothAmplitudes(p: LinePasses): Float64Array {
  const n = p.t.length;
  const out = new Float64Array(n).fill(NaN);
  const list: number[] = [];
  const flush = (): void => {
    const m = list.length;
    const pre = new Float64Array(m + 1);
    for (let i = 0; i < m; i++) pre[i + 1] = pre[i]! + p.amplitude[list[i]!]!;
    for (let i = 0; i < m; i++) {
      const lo = Math.max(0, i - SMOOTH);
      const hi = Math.min(m, i + SMOOTH + 1);
      out[list[i]!] = (pre[hi]! - pre[lo]!) / (hi - lo);
    }
    list.length = 0;
  };
  let seg = -1;
  for (let c = 0; c < n; c++) {
    if (!p.use[c] || !Number.isFinite(p.amplitude[c]!)) continue;
    if (p.segment[c] !== seg) flush(), (seg = p.segment[c]!);
    list.push(c);
  }
  flush();
  return out;
}

/** The usable passes as flat columns (k, τ, z), segments as runs [segStart[j], segStart[j + 1]), and what the modelled walk needs. */
interface LineColumns {
  readonly K: Float64Array;
  readonly TAU: Float64Array;
  readonly Z: Float64Array;
  readonly segStart: number[];
  /** Σ (∂Δτ/∂θ̄)² over the steps, their number, and Σ of the raw amplitudes' squared scatter about the smoothed ones. */
  readonly grad2: number;
  readonly steps: number;
  readonly dev2: number;
  readonly devN: number;
}

/** Reduced pass times τ (divided half-periods summed per segment), pass numbers and alternation regressors. */
function lineColumns(p: LinePasses, th: Float64Array, mu: ((theta: number) => number) | null): LineColumns {
  const n = p.t.length;
  const K = new Float64Array(n);
  const TAU = new Float64Array(n);
  const Z = new Float64Array(n);
  const segStart: number[] = [];
  let m = 0;
  let grad2 = 0;
  let steps = 0;
  let dev2 = 0;
  let devN = 0;
  let seg = -1;
  let last = -1;
  for (let c = 0; c < n; c++) {
    if (!p.use[c] || !Number.isFinite(th[c]!)) continue;
    if (p.segment[c] !== seg || segStart.length === 0) {
      seg = p.segment[c]!;
      segStart.push(m);
      // τ starts at 0 in each segment (only differences matter), which keeps the sums well conditioned.
      TAU[m] = 0;
    } else {
      const tb = 0.5 * (th[last]! + th[c]!);
      const r = periodRatio(tb);
      const dt = p.t[c]! - p.t[last]!;
      TAU[m] = TAU[m - 1]! + dt / r;
      const h = 1e-5;
      const lo = Math.max(0, tb - h);
      const dr = (periodRatio(tb + h) - periodRatio(lo)) / (tb + h - lo);
      grad2 += ((dt * dr) / (r * r)) ** 2;
      steps++;
    }
    if (Number.isFinite(p.amplitude[c]!)) (dev2 += (p.amplitude[c]! - th[c]!) ** 2), devN++;
    const sgn = p.index[c]! % 2 === 0 ? -1 : 1;
    K[m] = p.index[c]!;
    Z[m] = (sgn * (mu ? mu(th[c]!) : 1)) / periodRatio(th[c]!);
    last = c;
    m++;
  }
  segStart.push(m);
  return { K, TAU, Z, segStart, grad2, steps, dev2, devN };
}

/**
 * Partials out [1, z] per segment from k and τ (Frisch–Waugh–Lovell), in place; segments under 4 passes are left
 * out. Returns the slope β of τ on k, Σk², the passes used and the partialled columns of each used segment.
 */
function partialOut(col: LineColumns): { beta: number; skk: number; used: number; kt: Float64Array[]; tt: Float64Array[] } | null {
  const { K, TAU, Z, segStart } = col;
  let skk = 0;
  let skt = 0;
  let used = 0;
  const kt: Float64Array[] = [];
  const tt: Float64Array[] = [];
  for (let j = 0; j + 1 < segStart.length; j++) {
    const a = segStart[j]!;
    const b = segStart[j + 1]!;
    const len = b - a;
    if (len < 4) continue;
    let zb = 0;
    let kb = 0;
    let tb = 0;
    for (let i = a; i < b; i++) (zb += Z[i]!), (kb += K[i]!), (tb += TAU[i]!);
    zb /= len;
    kb /= len;
    tb /= len;
    let szz = 0;
    let szk = 0;
    let szt = 0;
    for (let i = a; i < b; i++) {
      Z[i] = Z[i]! - zb;
      K[i] = K[i]! - kb;
      TAU[i] = TAU[i]! - tb;
      szz += Z[i]! * Z[i]!;
      szk += Z[i]! * K[i]!;
      szt += Z[i]! * TAU[i]!;
    }
    const bk = szz > 0 ? szk / szz : 0;
    const bt = szz > 0 ? szt / szz : 0;
    for (let i = a; i < b; i++) {
      K[i] = K[i]! - bk * Z[i]!;
      TAU[i] = TAU[i]! - bt * Z[i]!;
      skk += K[i]! * K[i]!;
      skt += K[i]! * TAU[i]!;
    }
    used += len;
    kt.push(K.subarray(a, b));
    tt.push(TAU.subarray(a, b));
  }
  if (used < 8 || !(skk > 0)) return null;
  return { beta: skt / skk, skk, used, kt, tt };
}

/** The residuals' white part σ_w² and walk σ_u² per pass: lag-1 and long-lag differences, and the modelled walk. */
function residualNoise(col: LineColumns, kt: Float64Array[], tt: Float64Array[], beta: number): { white2: number; walk2: number } {
  let d1 = 0;
  let n1 = 0;
  let dL = 0;
  let nL = 0;
  const lag = (m: number): number => Math.max(2, Math.min(LONG_LAG, Math.floor(m / 4)));
  let lagUsed = LONG_LAG;
  for (let j = 0; j < kt.length; j++) {
    const m = kt[j]!.length;
    if (m < 4) continue;
    const res = kt[j]!.map((k, i) => tt[j]![i]! - beta * k);
    const L = lag(m);
    lagUsed = Math.min(lagUsed, L);
    for (let i = 1; i < m; i++) (d1 += (res[i]! - res[i - 1]!) ** 2), n1++;
    for (let i = L; i < m; i++) (dL += (res[i]! - res[i - L]!) ** 2), nL++;
  }
  const v1 = n1 ? d1 / n1 : 0;
  const vL = nL ? dL / nL : v1;
  const W = 2 * SMOOTH + 1;
  const sigmaTheta2 = col.devN > W ? ((col.dev2 / col.devN) * W) / (W - 1) : 0;
  const walkModel = col.steps ? (col.grad2 / col.steps) * sigmaTheta2 : 0;
  const walkSeen = (vL - v1) / Math.max(1, lagUsed - 1);
  const walkSeenU = nL ? (vL * Math.sqrt((2 * lagUsed) / nL)) / Math.max(1, lagUsed - 1) : Infinity;
  const walk2 = Math.max(walkModel, walkSeen > 2 * walkSeenU ? walkSeen : 0);
  // Lag-1 differences hold 2σ_w² plus one step of the walk; not subtracting that step keeps σ_w on the safe side
  // (a smooth misfit seen as a walk would otherwise wipe out the white part).
  return { white2: v1 / 2, walk2 };
}

/** Σc² and ΣC² of the slope's weights c = k/Σk² on τ and their tail sums C. */
function weightSums(kt: Float64Array[], skk: number): { cc: number; tails: number } {
  let cc = 0;
  let tails = 0;
  for (const k1 of kt) {
    let tail = 0;
    for (let i = k1.length - 1; i >= 1; i--) {
      const c = k1[i]! / skk;
      cc += c * c;
      tail += c;
      tails += tail * tail;
    }
    if (k1.length) cc += (k1[0]! / skk) ** 2;
  }
  return { cc, tails };
}

/**
 * Fits T0; `mu(θ)` is the mid-transit shift per metre of gate offset (null: a constant alternation).
 * Null with fewer than 8 usable passes.
 */
export function fitT0Line(p: LinePasses, mu: ((theta: number) => number) | null): T0Line | null {
  const col = lineColumns(p, smoothAmplitudes(p), mu);
  const fit = partialOut(col);
  if (!fit) return null;
  const { white2, walk2 } = residualNoise(col, fit.kt, fit.tt, fit.beta);
  const { cc, tails } = weightSums(fit.kt, fit.skk);
  const varBeta = white2 * cc + walk2 * tails;
  return { T0: 2 * fit.beta, u_T0: 2 * Math.sqrt(varBeta), passes: fit.used, sigmaWhite_s: Math.sqrt(white2), sigmaWalk_s: Math.sqrt(walk2) };
}
