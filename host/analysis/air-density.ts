// Density of moist air by the CIPM-2007 equation (Picard, Davis, Gläser, Fujii, Metrologia 45, 149 (2008);
// docs/references.md#ref-air-density): what buoyancy and added mass need, from the room sensor's readings.

/** Room conditions as the sensor gives them. */
export interface AirConditions {
  readonly tempC: number;
  readonly pressPa: number;
  /** Relative humidity, percent. */
  readonly rhPct: number;
  /** Mole fraction of CO2; CIPM-2007's reference value when not given. */
  readonly xCO2?: number;
}

const R = 8.314472; // J mol⁻¹ K⁻¹ (CODATA 2006, as the paper uses)
const MV = 18.01528e-3; // kg/mol, water
// Saturation vapour pressure over water: psv = exp(A T² + B T + C + D/T) Pa.
const A = 1.2378847e-5;
const B = -1.9121316e-2;
const C = 33.93711047;
const D = -6.3431645e3;
// Enhancement factor f = α + β p + γ t².
const ALPHA = 1.00062;
const BETA = 3.14e-8;
const GAMMA = 5.6e-7;
// Compressibility factor.
const A0 = 1.58123e-6;
const A1 = -2.9331e-8;
const A2 = 1.1043e-10;
const B0 = 5.707e-6;
const B1 = -2.051e-8;
const C0 = 1.9898e-4;
const C1 = -2.376e-6;
const DZ = 1.83e-11;
const EZ = -0.765e-8;

/** Mole fraction of water vapour from relative humidity (CIPM-2007: x_v = h f(p, t) p_sv(T) / p). */
export function waterVapourFraction(c: AirConditions): number {
  const T = c.tempC + 273.15;
  const psv = Math.exp(A * T * T + B * T + C + D / T);
  const f = ALPHA + BETA * c.pressPa + GAMMA * c.tempC * c.tempC;
  return ((c.rhPct / 100) * f * psv) / c.pressPa;
}

/** Air density in kg/m³ (CIPM-2007). Relative standard uncertainty of the equation itself: 22e-6. */
export function airDensityCipm2007(c: AirConditions): number {
  const t = c.tempC;
  const T = t + 273.15;
  const p = c.pressPa;
  const xv = waterVapourFraction(c);
  const ma = (28.96546 + 12.011 * ((c.xCO2 ?? 0.0004) - 0.0004)) * 1e-3;
  const z =
    1 -
    (p / T) * (A0 + A1 * t + A2 * t * t + (B0 + B1 * t) * xv + (C0 + C1 * t) * xv * xv) +
    ((p * p) / (T * T)) * (DZ + EZ * xv * xv);
  return ((p * ma) / (z * R * T)) * (1 - xv * (1 - MV / ma));
}
