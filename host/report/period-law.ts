// The exact period law T/T0 = 2K(sin(θ0/2))/π used for the report's reference curve and notes.
// K by the arithmetic-geometric mean: K(k) = π / (2·AGM(1, √(1 − k²))) (DLMF 19.8.5).

/** T/T0 at amplitude θ0 (radians) by the exact law for the simple pendulum. */
export function periodRatio(theta0Rad: number): number {
  const k = Math.sin(Math.abs(theta0Rad) / 2);
  let a = 1;
  let b = Math.sqrt(1 - k * k);
  for (let i = 0; i < 40 && Math.abs(a - b) > 1e-15 * a; i++) [a, b] = [(a + b) / 2, Math.sqrt(a * b)];
  return 1 / a;
}
