// The swing plane over a run: the azimuth's rate with an uncertainty that allows for correlated residuals, the
// Foucault rate expected at the rig's latitude, and the Airy precession the measured ellipse implies.
import { linearFit } from './least-squares.ts';
import { lag1 } from './stats.ts';
import type { PlanePass } from './plane-passes.ts';

/** Earth's rotation, °/h (docs/references.md#ref-swing-plane). */
export const EARTH_RATE_DEG_PER_H = 15.041;

/** The `plane` object of `analyze --json` (its keys are a fixed contract). */
export interface PlaneSummary {
  readonly azimuth_start_deg: number;
  readonly azimuth_end_deg: number;
  readonly precession_deg_per_h: number;
  readonly precession_u_deg_per_h: number;
  readonly minor_axis_max_m: number;
  readonly foucault_deg_per_h: number | null;
  readonly airy_deg_per_h: number;
}

const DEG = 180 / Math.PI;

/** Unwraps an axis (defined mod 180°) pass to pass: each step taken as the smallest turn. */
export function unwrapAxis(az: readonly number[]): number[] {
  const out: number[] = [];
  for (const a of az) {
    let x = a;
    const prev = out.length ? out[out.length - 1]! : a;
    x -= Math.PI * Math.round((x - prev) / Math.PI);
    out.push(x);
  }
  return out;
}

/**
 * Unweighted least-squares slope of the unwrapped azimuth against time (rad/s) and its standard uncertainty.
 * The residuals are not independent: the axis of an ellipse on an anisotropic support rocks, and the Airy rate
 * changes as the ellipse decays, so they wander slowly. Modelling them as AR(1) with the lag-1 autocorrelation ρ
 * of the residuals multiplies the ordinary variance by (1 + ρ)/(1 − ρ) (the slope's regressor, time, is itself
 * perfectly smooth); ρ < 0 (passes alternating) is taken as 0, so the correction never narrows the interval.
 * docs/two-beam-geometry.md#the-rate-and-its-uncertainty.
 */
export function azimuthRate(t: readonly number[], az: readonly number[]): { rate: number; u: number; rho: number } | null {
  const y = unwrapAxis(az);
  const n = t.length;
  const t0 = t[0] ?? 0;
  const fit = linearFit(n, (i) => y[i]!, [() => 1, (i) => t[i]! - t0]);
  if (!fit || fit.dof < 2) return null;
  const resid = y.map((v, i) => v - fit.params[0]! - fit.params[1]! * (t[i]! - t0));
  const rho = Math.min(0.999, Math.max(0, lag1(resid)));
  const u = Math.sqrt(fit.cov[1]![1]! * ((1 + rho) / (1 - rho)));
  return { rate: fit.params[1]!, u, rho };
}

/** Foucault rate at a latitude, °/h counterclockwise from above (clockwise, negative, in the north). */
export function foucaultRate(latitudeDeg: number): number {
  return -EARTH_RATE_DEG_PER_H * Math.sin(latitudeDeg / DEG);
}

/** Summarises the measured passes; null when fewer than 3 are measured. */
export function summarizePlane(passes: readonly PlanePass[], o: { lengthM: number; omega0: number; latitudeDeg?: number }): PlaneSummary | null {
  const ok = passes.filter((p) => !p.flag && Number.isFinite(p.azimuth));
  const r = azimuthRate(
    ok.map((p) => p.t),
    ok.map((p) => p.azimuth),
  );
  if (!r) return null;
  const airy = ok.reduce((s, p) => s + (3 * p.a * p.b * o.omega0) / (8 * o.lengthM * o.lengthM), 0) / ok.length;
  return {
    azimuth_start_deg: ok[0]!.azimuth * DEG,
    azimuth_end_deg: ok[ok.length - 1]!.azimuth * DEG,
    precession_deg_per_h: r.rate * DEG * 3600,
    precession_u_deg_per_h: r.u * DEG * 3600,
    minor_axis_max_m: Math.max(...ok.map((p) => Math.abs(p.b))),
    foucault_deg_per_h: o.latitudeDeg === undefined ? null : foucaultRate(o.latitudeDeg),
    airy_deg_per_h: airy * DEG * 3600,
  };
}
