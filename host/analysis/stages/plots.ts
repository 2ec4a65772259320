// Stage: the downsampled series the report and the live view draw (≤ ~2000 points each), and the running g.
import type { RunPlane } from '../plane-of-run.ts';
import { qualityFactor } from '../damping.ts';
import type { GateOffset } from '../gate-offset.ts';
import type { ClockApplied, SequencedPasses } from '../passes.ts';
import type { PlotSeries } from '../result.ts';
import type { Decay } from './decay.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

const DEG = 180 / Math.PI;

/** Every `step`-th element, so plots stay ≤ ~max points. */
function thin<T>(xs: readonly T[], max = 2000): T[] {
  if (xs.length <= max) return [...xs];
  const step = xs.length / max;
  const out: T[] = [];
  for (let k = 0; k < max; k++) out.push(xs[Math.floor(k * step)]!);
  return out;
}

/** What the running g needs: the final g, its u, the statistical part of it, and the mean-of-periods T0 it scales from. */
export interface RunningGInput {
  readonly g: number | null;
  readonly g_u: number | null;
  readonly statRel: number;
  readonly T0mean: number | null;
}

/**
 * g from the cumulative mean of the reduced periods up to each of ≤ 100 times, scaled to the final g; its u keeps
 * the systematic part of the budget and replaces the statistics by the scatter so far.
 */
function runningG(p: SequencedPasses, per: Periods, red: Reduction, rg: RunningGInput): PlotSeries['gRunning'] {
  const out = { t_s: [] as number[], g: [] as number[], g_u: [] as number[] };
  const { g, g_u: gU } = rg;
  if (g === null || gU === null) return out;
  const sysRel2 = Math.max(0, (gU / g) ** 2 - (2 * rg.statRel) ** 2);
  const P0 = red.P0;
  const steps = Math.min(100, P0.length);
  let s = 0;
  let s2 = 0;
  let m = 0;
  let k0 = 0;
  for (let j = 1; j <= steps; j++) {
    const k1 = Math.floor((j * P0.length) / steps);
    for (; k0 < k1; k0++) if (red.keep[k0]) (s += P0[k0]!), (s2 += P0[k0]! ** 2), m++;
    if (m === 0) continue;
    const mean = s / m;
    const sdRel = m > 1 ? Math.sqrt(Math.max(0, s2 / m - mean * mean)) / mean / Math.sqrt(m) : 0;
    const gk = g * (rg.T0mean! / mean) ** 2;
    out.t_s.push(p.t[per.ends[k1 - 1]!]!);
    out.g.push(gk);
    out.g_u.push(gk * Math.sqrt(sysRel2 + 4 * sdRel * sdRel));
  }
  return out;
}

/** The plots stage. */
export function plotSeries(
  p: SequencedPasses,
  per: Periods,
  red: Reduction,
  decay: Decay,
  gate: GateOffset | null,
  clock: ClockApplied,
  T0: number | null,
  rg: RunningGInput,
  plane?: RunPlane | null,
): PlotSeries {
  const pvIdx = thin(Array.from({ length: per.ends.length }, (_, k) => k).filter((k) => Number.isFinite(red.pAmp[k]!)));
  const avIdx = thin(Array.from({ length: decay.t.length }, (_, i) => i));
  const hv = gate ? thin(gate.series.t_s.map((t, i) => [t, gate.series.diff_s[i]!] as const)) : [];
  const d = decay.damping;
  return {
    periodVsAmplitude: { amplitude_deg: pvIdx.map((k) => red.pAmp[k]! * DEG), period_s: pvIdx.map((k) => per.P[k]!) },
    amplitudeVsTime: { t_s: avIdx.map((i) => decay.t[i]!), amplitude_deg: avIdx.map((i) => decay.amplitude[i]! * DEG) },
    halfPeriodAlternation: { t_s: hv.map((x) => x[0]), diff_s: hv.map((x) => x[1]) },
    clockResiduals: { host_s: thin(clock.residuals.host_s), residual_s: thin(clock.residuals.residual_s) },
    gRunning: runningG(p, per, red, rg),
    qVsAmplitude:
      d && T0 !== null
        ? { amplitude_deg: d.windows.map((w) => w.amplitude * DEG), Q: d.windows.map((w) => qualityFactor({ a0: w.rate, a1: 0, a2: 0 }, w.amplitude, T0)) }
        : { amplitude_deg: [], Q: [] },
    ...(plane ? { plane: planeSeries(p, plane) } : {}),
  };
}

/** The plane's per-pass columns at the measured passes, thinned like the other series. */
function planeSeries(p: SequencedPasses, plane: RunPlane): NonNullable<PlotSeries['plane']> {
  const idx = thin(Array.from({ length: p.t.length }, (_, i) => i).filter((i) => Number.isFinite(plane.azimuthDeg[i]!)));
  return {
    t_s: idx.map((i) => p.t[i]!),
    azimuth_deg: idx.map((i) => plane.azimuthDeg[i]!),
    minor_axis_m: idx.map((i) => plane.minorM[i]!),
    semi_major_m: idx.map((i) => plane.semiMajorM[i]!),
  };
}
