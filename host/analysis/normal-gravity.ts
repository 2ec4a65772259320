// Expected local g: WGS-84 normal gravity (Somigliana closed form) with the second-order height formula.
// Constants and formulas: NIMA TR8350.2, 3rd ed. (2000), ch. 4 (eq. 4-1 closed form, eq. 4-3 height).

/** WGS-84 defining and derived constants (TR8350.2; docs/references.md#ref-normal-gravity). */
export const WGS84 = {
  a: 6378137,
  f: 1 / 298.257223563,
  /** Normal gravity at the equator and at the poles, m/s². */
  gammaE: 9.7803253359,
  gammaP: 9.8321849378,
  /** Somigliana's constant k = bγp/(aγe) − 1. */
  k: 0.00193185265241,
  e2: 6.69437999014e-3,
  /** m = ω²a²b/GM. */
  m: 0.00344978650684,
} as const;

/** Normal gravity on the ellipsoid at geodetic latitude φ (degrees), m/s². */
export function normalGravity(latitudeDeg: number): number {
  const s2 = Math.sin((latitudeDeg * Math.PI) / 180) ** 2;
  return (WGS84.gammaE * (1 + WGS84.k * s2)) / Math.sqrt(1 - WGS84.e2 * s2);
}

/**
 * Normal gravity at height h (m) above the ellipsoid: γ[1 − (2/a)(1 + f + m − 2f sin²φ)h + (3/a²)h²].
 * An elevation above sea level stands in for h here; the geoid undulation (≤ ~100 m) changes g by ≤ ~3e-5.
 */
export function normalGravityAtHeight(latitudeDeg: number, heightM: number): number {
  const { a, f, m } = WGS84;
  const s2 = Math.sin((latitudeDeg * Math.PI) / 180) ** 2;
  return normalGravity(latitudeDeg) * (1 - (2 / a) * (1 + f + m - 2 * f * s2) * heightM + (3 / (a * a)) * heightM * heightM);
}

/** The free-air gradient dγ/dh at the ellipsoid, s⁻² (about −3.086e-6). */
export function freeAirGradient(latitudeDeg: number): number {
  const { a, f, m } = WGS84;
  const s2 = Math.sin((latitudeDeg * Math.PI) / 180) ** 2;
  return -normalGravity(latitudeDeg) * (2 / a) * (1 + f + m - 2 * f * s2);
}
