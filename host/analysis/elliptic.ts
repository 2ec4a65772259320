// Complete and incomplete elliptic integrals of the first kind, and the exact large-amplitude period law.
//
// K(m) = π / (2·AGM(1, √(1−m))): Gauss's arithmetic-geometric mean, DLMF §19.8(i) and A&S §17.6 (docs/references.md#ref-elliptic-k).
// F(φ|m) = sin φ · R_F(cos²φ, 1 − m sin²φ, 1): Carlson's symmetric form, DLMF 19.25.5, evaluated by the
// duplication algorithm of DLMF §19.36(i) (B. C. Carlson, Numer. Algorithms 10, 13 (1995)).

/** Arithmetic-geometric mean of two non-negative numbers (quadratic convergence, ≤ 6 steps in double). */
export function agm(a: number, b: number): number {
  let x = a;
  let y = b;
  for (let i = 0; i < 40 && Math.abs(x - y) > 1e-15 * x; i++) {
    const m = 0.5 * (x + y);
    y = Math.sqrt(x * y);
    x = m;
  }
  return 0.5 * (x + y);
}

/** K(m), the complete elliptic integral of the first kind with parameter m = k² (A&S convention). */
export function ellipticK(m: number): number {
  if (!(m < 1)) return m === 1 ? Infinity : NaN;
  return Math.PI / (2 * agm(1, Math.sqrt(1 - m)));
}

/**
 * T/T0 = 2K(sin²(θ0/2))/π = 1/AGM(1, cos(θ0/2)) for a rigid pendulum of amplitude θ0 (radians).
 * Using cos(θ0/2) directly avoids the cancellation of 1 − m near θ0 = π.
 */
export function periodRatio(theta0: number): number {
  return 1 / agm(1, Math.cos(0.5 * Math.abs(theta0)));
}

/** The power series of T/T0 in θ0 to order 2·terms (OEIS A223067/A223068 coefficients), for checks and the fit. */
export const PERIOD_SERIES: readonly number[] = [1, 1 / 16, 11 / 3072, 173 / 737280, 22931 / 1321205760];

/** Carlson's symmetric integral R_F(x, y, z) for x, y, z ≥ 0, at most one of them zero. */
export function carlsonRF(x: number, y: number, z: number): number {
  let xn = x;
  let yn = y;
  let zn = z;
  for (let i = 0; i < 60; i++) {
    const mu = (xn + yn + zn) / 3;
    const dx = 1 - xn / mu;
    const dy = 1 - yn / mu;
    const dz = -(dx + dy);
    // The truncation error of the fifth-order tail below is below tol⁶/(4(1 − tol)) (Carlson 1995): 0.0025 gives 6e-17.
    if (Math.max(Math.abs(dx), Math.abs(dy), Math.abs(dz)) < 0.0025) {
      const e2 = dx * dy - dz * dz;
      const e3 = dx * dy * dz;
      return (1 - e2 / 10 + e3 / 14 + (e2 * e2) / 24 - (3 * e2 * e3) / 44) / Math.sqrt(mu);
    }
    const sx = Math.sqrt(xn);
    const sy = Math.sqrt(yn);
    const sz = Math.sqrt(zn);
    const lam = sx * (sy + sz) + sy * sz;
    xn = 0.25 * (xn + lam);
    yn = 0.25 * (yn + lam);
    zn = 0.25 * (zn + lam);
  }
  return NaN;
}

/** F(φ|m), the incomplete elliptic integral of the first kind, for |φ| ≤ π/2 and m sin²φ < 1. */
export function ellipticF(phi: number, m: number): number {
  const s = Math.sin(phi);
  const c = Math.cos(phi);
  return s * carlsonRF(c * c, 1 - m * s * s, 1);
}
