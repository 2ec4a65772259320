// g from a reversible pendulum timed about both knife edges: Bessel's formula and its uncertainty budget.
// 4π²/g = (T1² + T2²)/(2l) + (T1² − T2²)/(2(h1 − h2)) is exact for a rigid body at zero amplitude whatever its
// radius of gyration (Bessel 1826; docs/references.md#ref-reversible-pendulum): l, the knife-edge distance, must be
// known well; h1 − h2 only roughly, since its term is small when T1 ≈ T2.
import type { BudgetLine } from './result.ts';
import { combineBudget } from './uncertainty-budget.ts';

/** One pivot's zero-amplitude period with its uncertainty split by what is shared between the two pivots. */
export interface PivotPeriod {
  readonly T_s: number;
  /** Independent part (the T0 line's statistics), s. */
  readonly u_stat_s: number;
  /**
   * Amplitude reduction (flag width, sensor delays), s: the same flag and gate on both pivots, so the two shifts
   * are taken together (fully correlated).
   */
  readonly u_amp_s: number;
  /** This journal's own clock calibration, s: each journal estimates the rate afresh, so independent between pivots. */
  readonly u_clock_s?: number;
  /**
   * The amplitude reduction's part from this pivot's own flag radius, s (measured from this edge, so independent
   * between pivots; the transit reads w/R, so it is the radius's share of the flag term). Not in u_amp_s.
   */
  readonly u_radius_s?: number;
}

export interface BesselInput {
  readonly pivot1: PivotPeriod;
  readonly pivot2: PivotPeriod;
  /** Knife-edge distance l and its standard uncertainty, m. */
  readonly l_m: number;
  readonly l_u_m: number;
  /** Pivot 1 and pivot 2 to the centre of mass, m. */
  readonly h1_m: number;
  readonly h2_m: number;
  /** Standard uncertainty of h1 − h2, m (2·cm_distance_u_m when both come from one balance point). */
  readonly dh_u_m: number;
  /** Relative standard uncertainty of the device clock common to both pivots (a shared time base; 0 when none). */
  readonly clock_u_rel: number;
  /**
   * Air's buoyancy as a share of the body's weight, ρ_air·V/M (0 or absent: not corrected). For one outer shape
   * symmetric about the middle between the edges the added mass cancels exactly and the buoyancy leaves only
   * 4π²/g = sum + (1 − μ)·difference (docs/reversible-pendulum.md): nothing at all when T1 = T2.
   */
  readonly buoyancy_rel?: number;
}

export interface BesselResult {
  readonly g_m_s2: number;
  readonly g_u_m_s2: number;
  /** Each term's relative standard uncertainty of g. */
  readonly budget: BudgetLine[];
  /** The two terms of 4π²/g, s²/m: the first needs only l, the second is the small one that needs h1 − h2. */
  readonly sum_term: number;
  readonly difference_term: number;
}

/** 4π²/g by Bessel's formula. */
export function besselA(T1: number, T2: number, l: number, dh: number): number {
  return (T1 * T1 + T2 * T2) / (2 * l) + (T1 * T1 - T2 * T2) / (2 * dh);
}

/** g from Bessel's formula, with a budget line per input (GUM first-order propagation, JCGM 100:2008 §5.1). */
export function besselG(x: BesselInput): BesselResult | null {
  const T1 = x.pivot1.T_s;
  const T2 = x.pivot2.T_s;
  const l = x.l_m;
  const dh = x.h1_m - x.h2_m;
  if (!(T1 > 0 && T2 > 0 && l > 0) || !(Math.abs(dh) > 0)) return null;
  const air = 1 - (x.buoyancy_rel ?? 0);
  const A = (T1 * T1 + T2 * T2) / (2 * l) + (air * (T1 * T1 - T2 * T2)) / (2 * dh);
  if (!(A > 0)) return null;
  const g = (4 * Math.PI * Math.PI) / A;
  const dA_dl = -(T1 * T1 + T2 * T2) / (2 * l * l);
  const dA_ddh = -(air * (T1 * T1 - T2 * T2)) / (2 * dh * dh);
  const dA_dT1 = T1 / l + (air * T1) / dh;
  const dA_dT2 = T2 / l - (air * T2) / dh;
  const rel = (dA: number): number => Math.abs(dA) / A;
  const budget: BudgetLine[] = [
    { id: 'knife-edge-distance', name: 'knife-edge distance l', u_rel_g: rel(dA_dl * x.l_u_m), note: { kind: 'length', symbol: 'l', m: l, u_m: x.l_u_m } },
    {
      id: 'centre-of-mass-distances',
      name: 'centre-of-mass distances h1 − h2',
      u_rel_g: rel(dA_ddh * x.dh_u_m),
      note: { kind: 'centre-of-mass', m: dh, u_m: x.dh_u_m, period_difference_s: T1 - T2 },
    },
    { id: 'pivot-1-statistics', name: 'T1 (pivot 1, statistics)', u_rel_g: rel(dA_dT1 * x.pivot1.u_stat_s), note: { kind: 'period', symbol: 'T1', s: T1, u_s: x.pivot1.u_stat_s } },
    { id: 'pivot-2-statistics', name: 'T2 (pivot 2, statistics)', u_rel_g: rel(dA_dT2 * x.pivot2.u_stat_s), note: { kind: 'period', symbol: 'T2', s: T2, u_s: x.pivot2.u_stat_s } },
    {
      id: 'amplitude-reduction',
      name: 'amplitude reduction (both pivots, same flag and gate)',
      u_rel_g: rel(dA_dT1 * x.pivot1.u_amp_s + dA_dT2 * x.pivot2.u_amp_s),
      note: { kind: 'both-pivots', pivot1_u_s: x.pivot1.u_amp_s, pivot2_u_s: x.pivot2.u_amp_s },
    },
    // A common clock factor (1 + ε) scales A by (1 + 2ε) exactly; each journal's own calibration error moves its period alone.
    {
      id: 'clock',
      name: 'device clock (each journal calibrated on its own, and any common part)',
      u_rel_g: Math.hypot(2 * x.clock_u_rel, rel(dA_dT1 * (x.pivot1.u_clock_s ?? 0)), rel(dA_dT2 * (x.pivot2.u_clock_s ?? 0))),
      note: { kind: 'pivot-clocks', pivot1_u_s: x.pivot1.u_clock_s ?? 0, pivot2_u_s: x.pivot2.u_clock_s ?? 0, common_u_rel: x.clock_u_rel },
    },
  ];
  const r1 = x.pivot1.u_radius_s ?? 0;
  const r2 = x.pivot2.u_radius_s ?? 0;
  if (r1 > 0 || r2 > 0)
    budget.push({
      id: 'flag-radius',
      name: 'flag radius of each pivot (amplitude reduction, measured apart)',
      u_rel_g: Math.hypot(rel(dA_dT1 * r1), rel(dA_dT2 * r2)),
      note: { kind: 'each-pivot', pivot1_u_s: r1, pivot2_u_s: r2 },
    });
  // Applied only with the body's volume and mass; 10 % of it as its u (common practice, no source).
  if (air < 1) {
    const shift = ((1 - air) * Math.abs(T1 * T1 - T2 * T2)) / (2 * Math.abs(dh)) / A;
    budget.push({ id: 'air', name: 'correction: air buoyancy on the difference term (cancels at T1 = T2)', u_rel_g: 0.1 * shift, note: { kind: 'buoyancy-difference', ratio: 1 - air, g_rel: shift } });
  }
  return {
    g_m_s2: g,
    g_u_m_s2: g * combineBudget(budget),
    budget,
    sum_term: (T1 * T1 + T2 * T2) / (2 * l),
    difference_term: (air * (T1 * T1 - T2 * T2)) / (2 * dh),
  };
}

