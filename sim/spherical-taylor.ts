// High-order Taylor-series integrator for the spherical pendulum: the bob on a sphere of radius L, in Cartesian
// coordinates, with an anisotropic support, the Earth's rotation and linear damping. Each step's series is
// its own dense output, as in taylor.ts.
//
// In the frame of the room (x, y horizontal, z up, the pivot at the origin):
//   r'' = F − λ r,  F = g'·(−ẑ) − κ (u·r) u + 2W (v_y, −v_x, 0) + W² (x, y, 0) − b1 v,
// where λ r is the string's pull. |r| = L for all time requires (r·r)'' = 0, i.e. λ = (|v|² + r·F)/L².
// κ u (u·r) is a horizontal spring along the support's stiff axis u, so the two principal small-swing
// frequencies are ω² = g'/L + κ along u and g'/L across it. W = Ω_E sin(latitude) is the vertical component
// of the Earth's rotation: its Coriolis term and its centrifugal term W²ρ make the motion exactly that of an
// inertial pendulum seen from a turning room (the horizontal component is left out: it acts mostly along the
// string). Every term is a polynomial in the state, so the Taylor coefficients follow from Cauchy products
// (A. Jorba and M. Zou, Experiment. Math. 14, 99 (2005)).
import { horner, TAYLOR_ORDER } from './taylor.ts';

export interface SphericalOde {
  readonly L: number;
  /** Gravity along −z. */
  readonly g: number;
  /** Stiffness of the horizontal spring along the unit vector (ux, uy), per unit mass (1/s²). */
  readonly kappa: number;
  readonly ux: number;
  readonly uy: number;
  /** Vertical component of the room's rotation (rad/s), + counterclockwise from above. */
  readonly W: number;
  /** Linear damping (1/s). */
  readonly b1: number;
}

/** Target size of the last series terms, relative to L (positions) and Lω (velocities). */
const TOL = 1e-17;
const N = TAYLOR_ORDER;

/** The state (x, y, z, vx, vy, vz). */
export type State6 = [number, number, number, number, number, number];

const series = (): Float64Array => new Float64Array(N + 1);

/** (a·b)_k, the k-th coefficient of a product of two series. */
function cauchy(a: Float64Array, b: Float64Array, k: number): number {
  let s = 0;
  for (let j = 0; j <= k; j++) s += a[j]! * b[k - j]!;
  return s;
}

export class SphericalSeries {
  readonly x = series();
  readonly y = series();
  readonly z = series();
  readonly vx = series();
  readonly vy = series();
  readonly vz = series();
  private readonly lam = series();
  private readonly u = series();

  constructor(private readonly ode: SphericalOde) {}

  expand(s: Readonly<State6>): void {
    const { x, y, z, vx, vy, vz, lam, u } = this;
    const { L, g, kappa, ux, uy, W, b1 } = this.ode;
    [x[0], y[0], z[0], vx[0], vy[0], vz[0]] = s;
    for (let k = 0; k < N; k++) {
      u[k] = ux * x[k]! + uy * y[k]!;
      // r·F = −κ(u·r)² + W²ρ² + 2W(x v_y − y v_x) − g' z − b1 r·v, and |v|².
      const rF =
        -kappa * cauchy(u, u, k) +
        W * W * (cauchy(x, x, k) + cauchy(y, y, k)) +
        2 * W * (cauchy(x, vy, k) - cauchy(y, vx, k)) -
        g * z[k]! -
        b1 * (cauchy(x, vx, k) + cauchy(y, vy, k) + cauchy(z, vz, k));
      lam[k] = (cauchy(vx, vx, k) + cauchy(vy, vy, k) + cauchy(vz, vz, k) + rF) / (L * L);
      const ax = -kappa * ux * u[k]! + W * W * x[k]! + 2 * W * vy[k]! - b1 * vx[k]! - cauchy(lam, x, k);
      const ay = -kappa * uy * u[k]! + W * W * y[k]! - 2 * W * vx[k]! - b1 * vy[k]! - cauchy(lam, y, k);
      const az = (k === 0 ? -g : 0) - b1 * vz[k]! - cauchy(lam, z, k);
      const k1 = k + 1;
      x[k1] = vx[k]! / k1;
      y[k1] = vy[k]! / k1;
      z[k1] = vz[k]! / k1;
      vx[k1] = ax / k1;
      vy[k1] = ay / k1;
      vz[k1] = az / k1;
    }
  }

  /** A step size at which the truncated terms are below the tolerance. */
  stepSize(omega: number): number {
    const L = this.ode.L;
    let h = Infinity;
    for (const k of [N - 1, N]) {
      for (const [a, scale] of [
        [this.x, L],
        [this.y, L],
        [this.z, L],
        [this.vx, L * omega],
        [this.vy, L * omega],
        [this.vz, L * omega],
      ] as const) {
        const c = Math.abs(a[k]!) / scale;
        if (c > 0) h = Math.min(h, (TOL / c) ** (1 / k));
      }
    }
    return h;
  }

  /** The state at τ into the step. */
  at(tau: number): State6 {
    return [horner(this.x, tau), horner(this.y, tau), horner(this.z, tau), horner(this.vx, tau), horner(this.vy, tau), horner(this.vz, tau)];
  }
}

/** Puts a state back on the sphere |r| = L with v tangent (removes the integration's slow drift). */
export function project(s: State6, L: number): State6 {
  const [x, y, z, vx, vy, vz] = s;
  const f = L / Math.hypot(x, y, z);
  const X = x * f;
  const Y = y * f;
  const Z = z * f;
  const rv = (X * vx + Y * vy + Z * vz) / (L * L);
  return [X, Y, Z, vx - rv * X, vy - rv * Y, vz - rv * Z];
}

/** Energy per unit mass in the room's frame (the Jacobi integral): constant without damping. */
export function energy(o: SphericalOde, s: Readonly<State6>): number {
  const [x, y, z, vx, vy, vz] = s;
  const uDotR = o.ux * x + o.uy * y;
  return 0.5 * (vx * vx + vy * vy + vz * vz) + o.g * z + 0.5 * o.kappa * uDotR * uDotR - 0.5 * o.W * o.W * (x * x + y * y);
}

/** Vertical angular momentum per unit mass in the non-rotating frame: constant on an isotropic support without damping. */
export function angularMomentumZ(o: SphericalOde, s: Readonly<State6>): number {
  const [x, y, , vx, vy] = s;
  return x * vy - y * vx + o.W * (x * x + y * y);
}
