// Test oracle: complete and incomplete elliptic integrals, Jacobi elliptic functions and the exact undamped pendulum,
// written independently of host/analysis (which must never import this file).
//
// References: NIST DLMF §19.8(i) (K from the arithmetic–geometric mean), §19.16.1 and §19.25.5 (F from
// Carlson's R_F), §19.36(i) (duplication algorithm for R_F, after B. C. Carlson, Numer. Algorithms 10, 13
// (1995)), §22.20(ii) (sn, cn, dn by the descending AGM / Landen transformation); A&S ch. 16–17.
// All functions take the parameter m = k² (A&S convention), never the modulus k.

/** Arithmetic–geometric mean of two positive numbers. */
export function agm(a0: number, b0: number): number {
  let a = a0;
  let b = b0;
  for (let i = 0; i < 64 && Math.abs(a - b) > 1e-16 * a; i++) {
    const an = (a + b) / 2;
    b = Math.sqrt(a * b);
    a = an;
  }
  return (a + b) / 2;
}

/** Complete elliptic integral of the first kind K(m), 0 ≤ m < 1 (DLMF 19.8.5). */
export function ellipK(m: number): number {
  return Math.PI / (2 * agm(1, Math.sqrt(1 - m)));
}

/** K(m) given the complementary modulus k' = √(1 − m) directly, which avoids cancellation near m → 1. */
export function ellipKFromComplement(kp: number): number {
  return Math.PI / (2 * agm(1, kp));
}

/** Carlson's symmetric integral R_F(x, y, z), by duplication (DLMF 19.36(i)). */
export function carlsonRF(x0: number, y0: number, z0: number): number {
  let x = x0;
  let y = y0;
  let z = z0;
  for (let i = 0; i < 100; i++) {
    const a = (x + y + z) / 3;
    const dx = 1 - x / a;
    const dy = 1 - y / a;
    const dz = 1 - z / a;
    // The fifth-order tail below leaves an error of order dev^6: dev < 1e-3 gives ~1e-18.
    if (Math.max(Math.abs(dx), Math.abs(dy), Math.abs(dz)) < 1e-3) {
      const e2 = dx * dy - dz * dz;
      const e3 = dx * dy * dz;
      return (1 - e2 / 10 + e3 / 14 + (e2 * e2) / 24 - (3 * e2 * e3) / 44) / Math.sqrt(a);
    }
    const sx = Math.sqrt(x);
    const sy = Math.sqrt(y);
    const sz = Math.sqrt(z);
    const lam = sx * sy + sy * sz + sz * sx;
    x = (x + lam) / 4;
    y = (y + lam) / 4;
    z = (z + lam) / 4;
  }
  return NaN;
}

/** Incomplete elliptic integral of the first kind F(φ | m), |φ| ≤ π/2 (DLMF 19.25.5). */
export function ellipF(phi: number, m: number): number {
  const s = Math.sin(phi);
  const c = Math.cos(phi);
  return s * carlsonRF(c * c, 1 - m * s * s, 1);
}

/** Jacobi amplitude and sn, cn, dn of (u | m), 0 ≤ m < 1, by the descending AGM (DLMF 22.20(ii)). */
export function jacobi(u: number, m: number): { am: number; sn: number; cn: number; dn: number } {
  if (m === 0) return { am: u, sn: Math.sin(u), cn: Math.cos(u), dn: 1 };
  const a: number[] = [1];
  const c: number[] = [Math.sqrt(m)];
  let b = Math.sqrt(1 - m);
  let n = 0;
  while (Math.abs(c[n]!) > 1e-17 && n < 40) {
    const an = a[n]!;
    a.push((an + b) / 2);
    c.push((an - b) / 2);
    b = Math.sqrt(an * b);
    n++;
  }
  let phi = 2 ** n * a[n]! * u;
  for (let j = n; j > 0; j--) phi = (phi + Math.asin((c[j]! / a[j]!) * Math.sin(phi))) / 2;
  const sn = Math.sin(phi);
  // dn from DLMF 22.6.1 rather than cos φ0 / cos(φ1 − φ0), which loses digits as φ0 → π/2.
  return { am: phi, sn, cn: Math.cos(phi), dn: Math.sqrt(1 - m * sn * sn) };
}

/** The exact undamped plane pendulum θ'' = −ω0² sin θ released from rest at θ0 (0 < θ0 < π) at t = 0. */
export class ExactPendulum {
  readonly k: number;
  readonly m: number;
  readonly K: number;
  /** Full period. */
  readonly period: number;

  constructor(
    readonly theta0: number,
    readonly omega0: number,
  ) {
    this.k = Math.sin(theta0 / 2);
    this.m = this.k * this.k;
    this.K = ellipKFromComplement(Math.cos(theta0 / 2));
    this.period = (4 * this.K) / omega0;
  }

  /** θ(t) = 2 asin(k sn(K − ω0 t | m)). */
  angle(t: number): number {
    return 2 * Math.asin(this.k * jacobi(this.K - this.omega0 * t, this.m).sn);
  }

  /**
   * The times in [0, tEnd] at which θ passes φ (|φ| < θ0), ascending: ω0 t = K − F(ψ) + 4nK on the way
   * down from +θ0 and 3K + F(ψ) + 4nK on the way back, with sin ψ = sin(φ/2)/k.
   */
  crossings(phi: number, tEnd: number): number[] {
    const f = ellipF(Math.asin(Math.sin(phi / 2) / this.k), this.m);
    const out: number[] = [];
    for (let n = 0; ; n++) {
      const t1 = (this.K - f + 4 * n * this.K) / this.omega0;
      const t2 = (3 * this.K + f + 4 * n * this.K) / this.omega0;
      if (t1 > tEnd) break;
      out.push(t1);
      if (t2 <= tEnd) out.push(t2);
    }
    return out;
  }
}
