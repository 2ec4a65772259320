// Stage: the downsampled series the report and the live view draw (≤ ~2000 points each), and the running g.
import type { RunPlane } from '../plane-of-run.ts';
import { qualityFactor } from '../damping.ts';
import type { GateOffset } from '../gate-offset.ts';
import type { ClockApplied, SequencedPasses } from '../passes.ts';
import type { PlotSeries } from '../result.ts';
import type { RoomReading } from '../room-drift.ts';
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
  room?: readonly RoomReading[],
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
    t0VsTime: t0Windows(p, per, red),
    ...(room && room.length > 0 ? { room: roomSeries(room) } : {}),
  };
}

/** Windows of the reduced periods: ≤ 100, each the mean of an equal count (≥ 5) of kept periods, at their mean time. */
function t0Windows(p: SequencedPasses, per: Periods, red: Reduction): NonNullable<PlotSeries['t0VsTime']> {
  const kept: number[] = [];
  for (let k = 0; k < per.ends.length; k++) if (red.keep[k] && Number.isFinite(red.P0[k]!)) kept.push(k);
  const out = { t_s: [] as number[], T0_s: [] as number[] };
  const windows = Math.min(100, Math.floor(kept.length / 5));
  for (let w = 0; w < windows; w++) {
    const ks = kept.slice(Math.floor((w * kept.length) / windows), Math.floor(((w + 1) * kept.length) / windows));
    // A period's time is its middle: the pass that ends it minus half of it.
    out.t_s.push(ks.reduce((s, k) => s + p.t[per.ends[k]!]! - per.P[k]! / 2, 0) / ks.length);
    out.T0_s.push(ks.reduce((s, k) => s + red.P0[k]!, 0) / ks.length);
  }
  return out;
}

/** The room readings in time order, thinned like the other series. */
function roomSeries(room: readonly RoomReading[]): NonNullable<PlotSeries['room']> {
  const r = thin([...room].sort((a, b) => a.t_s - b.t_s));
  return { t_s: r.map((x) => x.t_s), temperature_C: r.map((x) => x.tempC), pressure_Pa: r.map((x) => x.pressPa), humidity_pct: r.map((x) => x.rhPct) };
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
