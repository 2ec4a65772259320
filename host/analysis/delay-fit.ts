// The gate's on/off delay difference from the run itself: a constant offset of every transit time biases the
// amplitudes by ∝ θ², so the periods miss the exact law P = T0·2K(sin²(θ/2))/π by ∝ θ³ (docs/references.md#ref-gate-delay).
//
// Δ = blocking − unblocking delay; a measured transit is the true one minus Δ, so amplitudes are solved from τ + Δ.
// With amplitudes θ_k(Δ0) at a trial Δ0 and their slopes s_k = dθ_k/dΔ, y_k = P_k/r(θ_k) = T0 + T0·x_k·(Δ − Δ0),
// x_k = r'(θ_k)s_k/r(θ_k): a straight line. It is fitted to batch means of consecutive periods (time order), so that
// correlated noise (periods sharing end passes, amplitude noise, slow drifts) shows in the residuals of the batches
// rather than being assumed white. The slopes come from the harmonic-bottom form (their ~1e-4 relative error
// scales Δ − Δ0 alone, and Δ0 is the rig's prior, so the error is ~1e-4 of a few µs).
import { periodRatio } from './elliptic.ts';

/** The delay difference fitted from the run: Δ (s) and its standard uncertainty (s), from `batches` batch means. */
export interface DelayFit {
  readonly delta_s: number;
  readonly u_s: number;
  readonly batches: number;
}

/** dθ0/dτ (rad/s) of the harmonic-bottom form sin(θ0/2) = φb/(2 sin(ω0τ/2)); NaN where it has no solution. */
export function amplitudeSlopePerTransit(transitS: number, phiB: number, omega0: number): number {
  const x = 0.5 * omega0 * transitS;
  const sx = Math.sin(x);
  const q = phiB / (2 * sx);
  if (!(x > 0 && x < Math.PI / 2 && q < 1)) return NaN;
  const dq = (-phiB * Math.cos(x) * 0.5 * omega0) / (2 * sx * sx);
  return (2 * dq) / Math.sqrt(1 - q * q);
}

/** d ln r/dθ of the exact law, by a central difference. */
function logRatioSlope(theta: number): number {
  const h = 1e-6;
  return (Math.log(periodRatio(theta + h)) - Math.log(periodRatio(Math.max(0, theta - h)))) / (theta + h - Math.max(0, theta - h));
}

/** Least-squares line y = a + b·x with b's standard uncertainty from the residuals; null when x has no spread. */
function line(x: readonly number[], y: readonly number[]): { a: number; b: number; u_b: number } | null {
  const n = x.length;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) (sxx += (x[i]! - mx) ** 2), (sxy += (x[i]! - mx) * (y[i]! - my));
  if (!(sxx > 0) || n < 3) return null;
  const b = sxy / sxx;
  const a = my - b * mx;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (y[i]! - a - b * x[i]!) ** 2;
  return { a, b, u_b: Math.sqrt(ss / (n - 2) / sxx) };
}

/**
 * Fits Δ from periods P (s) at amplitudes θ (rad, solved with `delta0`) with slopes dθ/dΔ (rad/s), the periods in
 * time order; `keep` marks the usable ones. Null with fewer than 40 usable periods or no spread of amplitude.
 */
export function fitDelayDifference(P: ArrayLike<number>, theta: ArrayLike<number>, slope: ArrayLike<number>, keep: ArrayLike<number>, delta0: number): DelayFit | null {
  const xs: number[] = [];
  const ys: number[] = [];
  for (let k = 0; k < P.length; k++) {
    if (!keep[k]) continue;
    const r = periodRatio(theta[k]!);
    const x = logRatioSlope(theta[k]!) * slope[k]!;
    const y = P[k]! / r;
    if (Number.isFinite(x) && Number.isFinite(y)) xs.push(x), ys.push(y);
  }
  if (xs.length < 40) return null;
  // A nearly constant amplitude leaves Δ and T0 degenerate (an exact run would still give a tiny u): no fit below a 2 % range.
  let lo = Infinity;
  let hi = 0;
  for (let k = 0; k < P.length; k++) if (keep[k] && Number.isFinite(theta[k]!)) (lo = Math.min(lo, theta[k]!)), (hi = Math.max(hi, theta[k]!));
  if (!(hi - lo > 0.02 * hi)) return null;
  // 10 to 40 batches: enough degrees of freedom for the residuals, long enough to hold the correlations.
  const nb = Math.max(10, Math.min(40, Math.floor(xs.length / 20)));
  const bx: number[] = [];
  const by: number[] = [];
  for (let j = 0; j < nb; j++) {
    const lo = Math.floor((j * xs.length) / nb);
    const hi = Math.floor(((j + 1) * xs.length) / nb);
    let sx = 0;
    let sy = 0;
    for (let i = lo; i < hi; i++) (sx += xs[i]!), (sy += ys[i]!);
    bx.push(sx / (hi - lo));
    by.push(sy / (hi - lo));
  }
  const f = line(bx, by);
  if (!f || !(f.a > 0)) return null;
  return { delta_s: delta0 + f.b / f.a, u_s: f.u_b / f.a, batches: nb };
}

/** The delay difference the analysis uses: the run's fit weighed with the rig's prior (inverse variances). */
export interface GateDelay {
  readonly difference_s: number;
  /** Standard uncertainty: the fit's (with the prior) and the flag width's, whose error the fit takes for a delay. */
  readonly difference_u_s: number;
  readonly statistical_u_s: number;
  /** How far Δ moves when the flag width is one standard uncertainty wider (s). */
  readonly width_shift_s: number;
  /** 'run' when the run pins Δ better than the prior; 'prior' when the amplitude range is too narrow to. */
  readonly source: 'run' | 'prior';
  /** The run's own fit (null when it could not be fitted), and the prior. */
  readonly run_s: number | null;
  readonly run_u_s: number | null;
  readonly prior_s: number;
  readonly prior_u_s: number;
}

/** The delay with the flag width's term added (`shiftS`: Δ at w + u_w minus Δ at w). */
export function withWidthTerm(d: GateDelay, shiftS: number): GateDelay {
  const sh = Number.isFinite(shiftS) ? shiftS : 0;
  return { ...d, width_shift_s: sh, difference_u_s: Math.hypot(d.statistical_u_s, sh) };
}

/** Combines the fit with the prior Δ = priorS ± priorU (a Gaussian prior). */
export function gateDelay(fit: DelayFit | null, priorS: number, priorU: number): GateDelay {
  const base = { run_s: fit ? fit.delta_s : null, run_u_s: fit ? fit.u_s : null, prior_s: priorS, prior_u_s: priorU };
  const none = { width_shift_s: 0, source: 'prior' as const };
  if (!fit || !(fit.u_s > 0) || !Number.isFinite(fit.delta_s)) return { ...base, ...none, difference_s: priorS, difference_u_s: priorU, statistical_u_s: priorU };
  const wf = 1 / fit.u_s ** 2;
  const wp = priorU > 0 ? 1 / priorU ** 2 : Infinity;
  if (!Number.isFinite(wp)) return { ...base, ...none, difference_s: priorS, difference_u_s: 0, statistical_u_s: 0 };
  const u = 1 / Math.sqrt(wf + wp);
  return { ...base, width_shift_s: 0, difference_s: (wf * fit.delta_s + wp * priorS) / (wf + wp), difference_u_s: u, statistical_u_s: u, source: fit.u_s < priorU ? 'run' : 'prior' };
}
