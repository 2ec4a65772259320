// High-order Taylor-series integrator for the damped pendulum: each step's series is its own dense output.
//
// θ'' = −ω0² sin θ − b1 θ' − b2 |θ'|θ' − b0 sgn θ'. Between turning points sgn θ' is a constant σ, so the
// right-hand side is analytic and its Taylor coefficients follow from the recurrences of automatic
// differentiation (sin/cos pair and a Cauchy product for θ'², as in A. Jorba and M. Zou, Experiment. Math.
// 14, 99 (2005)). The caller cuts steps at turning points, where σ flips.

/** Coefficients of θ'' = −w2 sin θ − b1 θ' − b2 |θ'|θ' − b0 sgn θ'. */
export interface PendulumOde {
  readonly w2: number;
  readonly b1: number;
  readonly b2: number;
  readonly b0: number;
}

export const TAYLOR_ORDER = 20;
/** Target size of the last series terms (radians, and radians × ω0 for θ'). */
const TOL = 1e-17;

export class TaylorSeries {
  readonly th = new Float64Array(TAYLOR_ORDER + 1);
  readonly v = new Float64Array(TAYLOR_ORDER + 1);
  private readonly s = new Float64Array(TAYLOR_ORDER + 1);
  private readonly c = new Float64Array(TAYLOR_ORDER + 1);
  private readonly q = new Float64Array(TAYLOR_ORDER + 1);

  constructor(private readonly ode: PendulumOde) {}

  /** Expands the solution through (θ, θ') with velocity sign σ on this segment. */
  expand(theta: number, vel: number, sigma: number): void {
    const { th, v, s, c, q } = this;
    const { w2, b1, b2, b0 } = this.ode;
    const N = TAYLOR_ORDER;
    th[0] = theta;
    v[0] = vel;
    s[0] = Math.sin(theta);
    c[0] = Math.cos(theta);
    q[0] = vel * vel;
    for (let k = 0; k < N; k++) {
      const k1 = k + 1;
      th[k1] = v[k]! / k1;
      v[k1] = (-w2 * s[k]! - b1 * v[k]! - sigma * b2 * q[k]! - (k === 0 ? sigma * b0 : 0)) / k1;
      // d(sin θ)/dt = cos θ · θ', d(cos θ)/dt = −sin θ · θ', and θ' has coefficients v.
      let ss = 0;
      let cc = 0;
      for (let j = 0; j <= k; j++) {
        ss += v[j]! * c[k - j]!;
        cc += v[j]! * s[k - j]!;
      }
      s[k1] = ss / k1;
      c[k1] = -cc / k1;
      if (b2 !== 0) {
        let qq = 0;
        for (let j = 0; j <= k1; j++) qq += v[j]! * v[k1 - j]!;
        q[k1] = qq;
      }
    }
  }

  /** A step size at which the truncated terms are below the tolerance. */
  stepSize(omega0: number): number {
    const N = TAYLOR_ORDER;
    let h = Infinity;
    for (const k of [N - 1, N]) {
      const a = Math.abs(this.th[k]!);
      const b = Math.abs(this.v[k]!) / omega0;
      if (a > 0) h = Math.min(h, (TOL / a) ** (1 / k));
      if (b > 0) h = Math.min(h, (TOL / b) ** (1 / k));
    }
    return h;
  }

  theta(tau: number): number {
    return horner(this.th, tau);
  }

  vel(tau: number): number {
    return horner(this.v, tau);
  }

  /** θ'' at τ, from the derivative of the velocity series. */
  acc(tau: number): number {
    return hornerDerivative(this.v, tau);
  }

  /**
   * The root in (lo, hi] of θ(τ) − target (which = 'theta') or θ'(τ) (which = 'vel'), known to change sign
   * over the bracket: Newton's method kept inside the bracket, bisection when it leaves it.
   */
  root(which: 'theta' | 'vel', target: number, lo0: number, hi0: number): number {
    if (which === 'theta')
      return bracketedRoot(
        (t) => this.theta(t) - target,
        (t) => this.vel(t),
        lo0,
        hi0,
      );
    return bracketedRoot(
      (t) => this.vel(t),
      (t) => this.acc(t),
      lo0,
      hi0,
    );
  }
}

/** The root in (lo, hi] of f, known to change sign over the bracket: Newton kept inside it, else bisection. */
export function bracketedRoot(f: (t: number) => number, df: (t: number) => number, lo0: number, hi0: number): number {
  let lo = lo0;
  let hi = hi0;
  let flo = f(lo);
  const fhi = f(hi);
  if (fhi === 0) return hi;
  let x = flo === fhi ? (lo + hi) / 2 : lo + (hi - lo) * (flo / (flo - fhi));
  for (let i = 0; i < 100; i++) {
    const fx = f(x);
    if (fx === 0) return x;
    if (Math.sign(fx) === Math.sign(flo)) {
      lo = x;
      flo = fx;
    } else hi = x;
    const d = df(x);
    let nx = d !== 0 ? x - fx / d : NaN;
    if (!(nx > lo && nx < hi)) nx = (lo + hi) / 2;
    if (Math.abs(nx - x) <= 1e-16 * Math.max(1, Math.abs(x)) || hi - lo <= 1e-18) return nx;
    x = nx;
  }
  return x;
}

export function horner(a: Float64Array, tau: number): number {
  let r = 0;
  for (let k = TAYLOR_ORDER; k >= 0; k--) r = r * tau + a[k]!;
  return r;
}

/** The series' derivative at τ. */
export function hornerDerivative(a: Float64Array, tau: number): number {
  let r = 0;
  for (let k = TAYLOR_ORDER; k >= 1; k--) r = r * tau + k * a[k]!;
  return r;
}
