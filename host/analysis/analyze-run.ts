// From numbered passes to the full analysis: periods, amplitudes, T0, B and C, gate offset, damping, g and budget.
import type { Rig } from '../../protocol/rig.ts';
import { fitDamping, qualityFactor } from './damping.ts';
import { periodRatio } from './elliptic.ts';
import { gateOffset, midShiftPerMetre } from './gate-offset.ts';
import { fitT0Line } from './t0-line-fit.ts';
import { normalGravityAtHeight } from './normal-gravity.ts';
import { pendulumModel } from './pendulum-corrections.ts';
import { clipMask, fitPeriodLaw, maskedMean, reducePeriods } from './period-law.ts';
import type { AnalysisResult, BudgetLine, PlotSeries, RunCounts, SwingRow } from './result.ts';
import { batchMeansStdError, median } from './stats.ts';
import { amplitudeFromTransit, amplitudeSensitivity, blockHalfAngle } from './transit-amplitude.ts';
import { combineBudget } from './uncertainty-budget.ts';

const DEG = 180 / Math.PI;
const NO_FLAGS: string[] = [];

/** Passes after sequencing (see host/pipeline/pass-sequencing.ts), parallel arrays. */
export interface SequencedPasses {
  /** Pass time, s since the journal start (device clock corrected, boots joined on the host clock). */
  readonly t: ArrayLike<number>;
  /**
   * Pass time, s since its boot's tick 0 (device clock corrected): every interval is taken from these, so the
   * numbers do not depend on the host times at all within a boot.
   */
  readonly td: ArrayLike<number>;
  /** Transit time, s (device clock corrected). */
  readonly transit: ArrayLike<number>;
  readonly index: ArrayLike<number>;
  readonly segment: ArrayLike<number>;
  /** 0 valid, 1 rejected for transit, 2 rejected for timing, 3 unsequenced. */
  readonly status: ArrayLike<number>;
  readonly bridgedBefore: ArrayLike<number>;
}

/** The clock correction that was applied to the pass times. */
export interface ClockApplied {
  readonly source: AnalysisResult['clock_source'];
  readonly ppm: number;
  readonly u_ppm: number;
  /** Null when the rate was not measured (nominal or given). */
  readonly measured: boolean;
  readonly drift_ppm_per_h: number | null;
  readonly span_s: number | null;
  readonly residuals: { readonly host_s: number[]; readonly residual_s: number[] };
}

/** Everything the analysis needs. */
export interface RunData {
  readonly rig: Rig | null;
  readonly passes: SequencedPasses;
  readonly clock: ClockApplied;
  readonly counts: RunCounts;
  readonly run: AnalysisResult['run'];
  readonly warnings: readonly string[];
  readonly settings: AnalysisResult['settings'];
  readonly lineRejections?: AnalysisResult['line_rejections'];
  /** Standard uncertainty of the sensor's blocking − unblocking delay difference, s (default 5 µs). */
  readonly delayDifferenceU_s?: number;
  /** Build the per-pass rows (default true); a summary or --json does not need them. */
  readonly rows?: boolean;
}

/** About `max` evenly spread values of an array (all when shorter): enough for a robust median, much cheaper. */
function everyKth(xs: ArrayLike<number>, max: number): Float64Array {
  const stride = Math.max(1, Math.floor(xs.length / max));
  const out = new Float64Array(Math.ceil(xs.length / stride));
  for (let i = 0, k = 0; i < xs.length; i += stride) out[k++] = xs[i]!;
  return out;
}

/** Every `step`-th element, so plots stay ≤ ~max points. */
function thin<T>(xs: readonly T[], max = 2000): T[] {
  if (xs.length <= max) return [...xs];
  const step = xs.length / max;
  const out: T[] = [];
  for (let k = 0; k < max; k++) out.push(xs[Math.floor(k * step)]!);
  return out;
}

const finiteOrNull = (v: number | null | undefined): number | null => (v !== null && v !== undefined && Number.isFinite(v) ? v : null);

/** Runs the analysis; total over partial data (nulls and warnings, never throws for thin data). */
export function analyzeRun(d: RunData): AnalysisResult {
  const warnings = [...d.warnings];
  const p = d.passes;
  const n = p.t.length;
  const rig = d.rig;

  // Half-periods and full periods (from the pass two numbers back, so a gate offset cancels to first order).
  const half = new Float64Array(n).fill(NaN);
  const period = new Float64Array(n).fill(NaN);
  const periodStart = new Int32Array(n).fill(-1);
  const periodMid = new Int32Array(n).fill(-1);
  let prev1 = -1;
  let prev2 = -1;
  let validCount = 0;
  for (let c = 0; c < n; c++) {
    if (p.index[c]! < 0) continue;
    validCount++;
    const idx = p.index[c]!;
    if (prev1 >= 0 && p.segment[prev1] !== p.segment[c]) prev1 = prev2 = -1;
    if (prev2 >= 0 && p.segment[prev2] !== p.segment[c]) prev2 = -1;
    if (prev1 >= 0 && p.index[prev1] === idx - 1) half[c] = p.td[c]! - p.td[prev1]!;
    const a = prev1 >= 0 && p.index[prev1] === idx - 2 ? prev1 : prev2 >= 0 && p.index[prev2] === idx - 2 ? prev2 : -1;
    if (a >= 0) {
      period[c] = p.td[c]! - p.td[a]!;
      periodStart[c] = a;
      periodMid[c] = prev1 >= 0 && p.index[prev1] === idx - 1 ? prev1 : -1;
    }
    prev2 = prev1;
    prev1 = c;
  }
  // A swing that barely clears the beam (transit over a third of the half-period, amplitude below ~2φb) has a
  // mid-transit time that moves with the amplitude and the gate offset far more than a period's noise: such
  // passes give amplitudes but no periods and no gate offset.
  const medHalf = median(everyKth(half, 4000));
  const slow = new Uint8Array(n);
  let slowCount = 0;
  for (let c = 0; c < n; c++) if (p.index[c]! >= 0 && p.transit[c]! > medHalf / 3) (slow[c] = 1), slowCount++;
  for (let c = 0; c < n; c++) if (Number.isFinite(period[c]!) && (slow[c] || slow[periodStart[c]!])) period[c] = NaN;
  if (slowCount > 0) warnings.push(`${slowCount} pass(es) barely cleared the beam (transit over a third of the half-period): used for amplitudes only`);
  const pIdx: number[] = [];
  for (let c = 0; c < n; c++) if (Number.isFinite(period[c]!)) pIdx.push(c);
  const P = Float64Array.from(pIdx, (c) => period[c]!);

  // Amplitudes (exact transit-time solution) and the zero-amplitude period, iterated since ω0 = 2π/T0.
  const amp = new Float64Array(n).fill(NaN);
  const pAmp = new Float64Array(pIdx.length).fill(NaN);
  let T0: number | null = P.length ? median(everyKth(P, 4000)) : null;
  let P0: Float64Array = P;
  let clipped = 0;
  const phiB = rig ? blockHalfAngle(rig.flag_width_m, rig.length_m) : NaN;
  // Amplitudes of the passes of every `stride`-th period (all passes when stride is 1).
  const fillAmplitudes = (t0: number, stride: number): void => {
    const omega0 = (2 * Math.PI) / t0;
    const at = (c: number): number => amplitudeFromTransit(p.transit[c]!, phiB, omega0);
    if (stride === 1) for (let c = 0; c < n; c++) amp[c] = p.index[c]! >= 0 ? at(c) : NaN;
    for (let k = 0; k < pIdx.length; k += stride) {
      const c = pIdx[k]!;
      const a = periodStart[c]!;
      const m = periodMid[c]!;
      if (stride > 1) for (const q of [a, m, c]) if (q >= 0) amp[q] = at(q);
      pAmp[k] = m >= 0 ? 0.25 * (amp[a]! + 2 * amp[m]! + amp[c]!) : 0.5 * (amp[a]! + amp[c]!);
    }
  };
  let keep: Uint8Array = new Uint8Array(P.length).fill(1);
  if (T0 !== null && rig) {
    // ω0 = 2π/T0 enters the amplitudes, which enter T0: a fixed point that converges by a factor of about
    // −θ0²/24 per round (−0.15 at 60°). Iterate it to convergence on a subsample of ≤ ~2000 periods first,
    // then compute every amplitude, and repeat on all periods only while T0 still moves by more than 1e-9.
    const stride = Math.max(1, Math.floor(pIdx.length / 2000));
    let subKeep: Uint8Array | null = null;
    for (let iter = 0; iter < 60; iter++) {
      fillAmplitudes(T0, stride);
      const sub: number[] = [];
      for (let k = 0; k < pIdx.length; k += stride) sub.push(P[k]! / periodRatio(pAmp[k]!));
      // The outlier mask from the second round on (the first T0 guess is the raw median period).
      if (iter <= 1) subKeep = clipMask(sub).keep;
      const t1 = maskedMean(sub, subKeep!);
      if (!Number.isFinite(t1)) break;
      const moved = Math.abs(t1 - T0) / T0;
      T0 = t1;
      if (moved < 1e-12) break;
    }
    for (let iter = 0; iter < 5; iter++) {
      fillAmplitudes(T0, 1);
      P0 = reducePeriods(P, pAmp);
      const cm = clipMask(P0);
      keep = cm.keep;
      clipped = cm.clipped;
      const t2 = maskedMean(P0, keep);
      if (!Number.isFinite(t2)) break;
      const moved = Math.abs(t2 - T0) / T0;
      T0 = t2;
      // A relative change ε of ω0 moves the amplitudes by ~ε and T0 back by ~ε·θ²/8: stop when that is < 1e-10.
      let maxA = 0;
      for (let k = 0; k < pAmp.length; k++) if (pAmp[k]! > maxA) maxA = pAmp[k]!;
      if ((moved * maxA * maxA) / 8 < 1e-10) break;
    }
  } else if (T0 !== null) {
    const cm = clipMask(P);
    keep = cm.keep;
    clipped = cm.clipped;
    T0 = maskedMean(P, keep);
    warnings.push('no rig description: amplitudes, the reduction to zero amplitude and g are not available (give --rig FILE)');
  }
  if (clipped > 0) warnings.push(`${clipped} period(s) far from the rest were left out of the mean of periods`);

  // The final T0: a line through the amplitude-reduced pass times (t0-line-fit.ts), far more efficient than the
  // mean of the periods, which stays for the per-swing table and the running g. The fixed point above used the mean;
  // the two differ by far less than the amplitude's sensitivity to ω0 could feel.
  const T0mean = T0;
  let line: ReturnType<typeof fitT0Line> = null;
  if (T0 !== null) {
    const use = new Uint8Array(n);
    for (let c = 0; c < n; c++) use[c] = p.index[c]! >= 0 && !slow[c] ? 1 : 0;
    const omega0m = (2 * Math.PI) / T0;
    line = fitT0Line(
      { index: p.index, segment: p.segment, t: p.td, amplitude: rig ? amp : new Float64Array(n), use },
      rig ? (th: number) => midShiftPerMetre(th, omega0m, rig.flag_width_m, rig.length_m) : null,
    );
    if (line && Number.isFinite(line.T0)) T0 = line.T0;
  }
  if (T0 === null) warnings.push(validCount === 0 ? 'no valid passes: nothing to analyse' : 'fewer than three passes in a row: no full period yet');

  // Amplitudes of valid passes in time order, for the start/end values and damping.
  const ampT: number[] = [];
  const ampA: number[] = [];
  for (let c = 0; c < n; c++) if (Number.isFinite(amp[c]!)) ampT.push(p.t[c]!), ampA.push(amp[c]!);
  if (rig && T0 !== null && validCount > 0 && ampA.length < validCount) {
    // With the right w and L every pass that is not slow (transit < H/3, θ0 ≳ 2φb) has an amplitude.
    let fastMissing = 0;
    for (let c = 0; c < n; c++) if (p.index[c]! >= 0 && !slow[c] && !Number.isFinite(amp[c]!)) fastMissing++;
    warnings.push(
      `${validCount - ampA.length} pass(es) had a transit longer than a swing that just clears the beam would give: no amplitude for them` +
        (fastMissing > 0 ? ` (${fastMissing} of them well clear of the beam: check flag_width_m and length_m)` : ' (the swing was dying out)'),
    );
  }
  const medA = ampA.length ? median(ampA) : NaN;
  const damping = T0 !== null && ampA.length ? fitDamping(ampT, ampA, T0, medA) : null;
  if (T0 !== null && rig && !damping) warnings.push('too few swings, or too little decay, to fit the damping (needs ≥ 40 passes)');

  const law = fitPeriodLaw(
    Float64Array.from(pIdx, (c) => period[c]!),
    pAmp,
  );
  if (T0 !== null && rig && !law) warnings.push('too few periods or too narrow an amplitude range to fit T = T0(1 + Bθ0² + Cθ0⁴) (B would be uncertain by > 30 %)');
  else if (law && law.C === null)
    warnings.push('C is held at 11/3072: the amplitudes do not reach 20°, or do not pin C down (θ0⁴ cannot be told from θ0² there)');

  const omega0 = T0 !== null ? (2 * Math.PI) / T0 : NaN;
  const gate = rig && T0 !== null ? gateOffset({ index: p.index, segment: p.segment, t: p.td, tPlot: p.t, amplitude: amp.map((v, c) => (slow[c] ? NaN : v)) }, omega0, rig.flag_width_m, rig.length_m) : null;
  if (gate && gate.alignedSegments > 0)
    warnings.push(`gate offset: the side of ${gate.alignedSegments} later segment(s) was matched to the first (passes between segments are not known)`);

  // Sensitivity of the amplitude at the median pass.
  let sens: AnalysisResult['amplitude_sensitivity'] = null;
  const delayU = d.delayDifferenceU_s ?? 5e-6;
  if (rig && Number.isFinite(medA)) {
    let best = -1;
    for (let c = 0; c < n; c++) if (Number.isFinite(amp[c]!) && (best < 0 || Math.abs(amp[c]! - medA) < Math.abs(amp[best]! - medA))) best = c;
    const s = amplitudeSensitivity(p.transit[best]!, rig.flag_width_m, rig.length_m, omega0);
    sens = {
      at_amplitude_deg: amp[best]! * DEG,
      per_width_deg_per_mm: (s.dTheta_dWidth_rad_per_m * DEG) / 1000,
      per_delay_difference_deg_per_us: (-s.dTheta_dTransit_rad_per_s * DEG) / 1e6,
    };
  }

  // T0 corrections, g and the budget.
  const q = damping ? damping.Q : null;
  const model = rig && T0 !== null ? pendulumModel(rig, omega0, q) : null;
  const dampRel = model ? model.lines.find((l) => l.name.startsWith('damping'))!.period_rel : 0;
  const T0u = T0 !== null ? T0 / (1 + dampRel) : null;
  const budget: BudgetLine[] = [];
  const P0used: number[] = [];
  for (let i = 0; i < P0.length; i++) if (keep[i] === 1) P0used.push(P0[i]!);
  const uStatRel = line && T0 !== null ? line.u_T0 / T0 : T0 !== null && P0used.length > 1 ? batchMeansStdError(P0used) / T0 : NaN;
  let g: number | null = null;
  let gU: number | null = null;
  let T0_u: number | null = null;
  if (T0u !== null) {
    // The reduction's sensitivity to w and to the on/off delay difference: every amplitude solved again with the
    // input moved by its standard uncertainty (the effect grows like θ³, so one operating point would not do).
    // Either estimator of T0 moves alike under such a systematic change; the mean of periods shows it directly.
    const redShift = (phi: number, dTransit: number): number => {
      if (!rig || T0mean === null) return 0;
      const omega0m = (2 * Math.PI) / T0mean;
      // On an even subsample of ≤ ~4000 periods: plenty for the size of a systematic shift, and far cheaper.
      const a2 = new Float64Array(n).fill(NaN);
      const pa = new Float64Array(pIdx.length).fill(NaN);
      const step = Math.max(1, Math.floor(pIdx.length / 4000));
      const sub = new Uint8Array(pIdx.length);
      for (let k = 0; k < pIdx.length; k += step) sub[k] = keep[k]!;
      for (let k = 0; k < pIdx.length; k += step) {
        const c = pIdx[k]!;
        const a = periodStart[c]!;
        const m = periodMid[c]!;
        for (const q of [a, m, c]) if (q >= 0 && Number.isNaN(a2[q]!)) a2[q] = amplitudeFromTransit(p.transit[q]! + dTransit, phi, omega0m);
        pa[k] = m >= 0 ? 0.25 * (a2[a]! + 2 * a2[m]! + a2[c]!) : 0.5 * (a2[a]! + a2[c]!);
      }
      return Math.abs(maskedMean(reducePeriods(P, pa), sub) / maskedMean(P0, sub) - 1);
    };
    const uRedW = rig ? redShift(blockHalfAngle(rig.flag_width_m + rig.flag_width_u_m, rig.length_m), 0) : 0;
    const uRedD = rig ? redShift(phiB, delayU) : 0;
    const uClock = d.clock.u_ppm * 1e-6;
    if (Number.isFinite(uStatRel))
      budget.push({
        name: 'period timing (statistics)',
        u_rel_g: 2 * uStatRel,
        note: line
          ? `line through ${line.passes} reduced pass times; white ${(line.sigmaWhite_s * 1e6).toFixed(2)} µs, walk ${(line.sigmaWalk_s * 1e6).toFixed(3)} µs per pass`
          : `${P0used.length} periods`,
      });
    budget.push({ name: `device clock (${d.clock.source})`, u_rel_g: 2 * uClock, note: `${d.clock.ppm.toFixed(2)} ± ${d.clock.u_ppm.toPrecision(2)} ppm` });
    if (rig) {
      budget.push({ name: 'flag width (amplitude reduction)', u_rel_g: 2 * uRedW, note: `w = ${(rig.flag_width_m * 1000).toFixed(2)} ± ${(rig.flag_width_u_m * 1000).toFixed(2)} mm` });
      budget.push({ name: 'sensor on/off delay difference (amplitude reduction)', u_rel_g: 2 * uRedD, note: `assumed ±${(delayU * 1e6).toFixed(0)} µs (common practice, no source)` });
    }
    T0_u = T0u * Math.hypot(Number.isFinite(uStatRel) ? uStatRel : 0, uClock, uRedW, uRedD);
    if (rig && model) {
      budget.unshift({ name: 'length L (pivot to bob centre)', u_rel_g: rig.length_u_m / model.L_eff_m, note: `L = ${rig.length_m} ± ${rig.length_u_m} m` });
      for (const line of model.lines) {
        if (line.period_rel === 0) continue;
        // Applied corrections: their own u, else 10 % of their size (assumed, no source); unapplied: a rectangular half-width.
        const u = line.u_rel ?? (line.applied ? 0.1 * Math.abs(line.period_rel) : Math.abs(line.period_rel) / Math.sqrt(3));
        budget.push({ name: `${line.applied ? 'correction' : 'uncorrected'}: ${line.name}`, u_rel_g: 2 * u, note: line.why });
      }
      g = (4 * Math.PI * Math.PI * model.L_eff_m * (1 + model.air_rel) ** 2) / (T0u * T0u);
      gU = g * combineBudget(budget);
    }
  }
  let expected: number | null = null;
  if (rig && rig.latitude_deg !== undefined) {
    expected = normalGravityAtHeight(rig.latitude_deg, rig.elevation_m ?? 0);
    if (rig.elevation_m === undefined) warnings.push('expected g assumes elevation 0 m (the rig gives no elevation_m)');
  }
  const diffSigma = g !== null && gU !== null && expected !== null && gU > 0 ? (g - expected) / gU : null;
  if (d.clock.source === 'nominal' && g !== null) warnings.push(`g uses the nominal device clock (±${d.clock.u_ppm.toFixed(0)} ppm assumed): its uncertainty is dominated by the clock`);
  const clockShare = budget.find((b) => b.name.startsWith('device clock'));
  if (d.clock.measured && clockShare && gU !== null && g !== null && clockShare.u_rel_g > 0.5 * (gU / g))
    warnings.push('the clock calibration is too uncertain to be negligible: record longer, or give --clock pps / --clock <ppm>');

  // Swing table.
  const swings: SwingRow[] = [];
  const pk = new Int32Array(n).fill(-1);
  pIdx.forEach((c, k) => (pk[c] = k));
  for (let c = 0; c < (d.rows === false ? 0 : n); c++) {
    const st = p.status[c]!;
    const flags: string[] = st === 0 && p.bridgedBefore[c] === 0 && p.index[c] !== 0 && !slow[c] ? NO_FLAGS : [];
    if (st === 1) flags.push('rejected:transit');
    else if (st === 2) flags.push('rejected:timing');
    else if (st === 3) flags.push('unsequenced');
    if (p.bridgedBefore[c]! > 0) flags.push(`bridged:${p.bridgedBefore[c]}`);
    if (slow[c]) flags.push('slow-transit');
    if (p.index[c] === 0) flags.push(`segment-start:${p.segment[c]}`);
    const k = pk[c]!;
    swings.push({
      index: c,
      t_s: p.t[c]!,
      transit_s: p.transit[c]!,
      half_period_s: finiteOrNull(half[c]),
      period_s: finiteOrNull(period[c]),
      amplitude_deg: finiteOrNull(amp[c]! * DEG),
      period0_s: k >= 0 && rig ? finiteOrNull(P0[k]) : null,
      flags,
    });
  }

  // Plots.
  const pvIdx = thin(Array.from({ length: pIdx.length }, (_, k) => k).filter((k) => Number.isFinite(pAmp[k]!)));
  const avIdx = thin(Array.from({ length: ampT.length }, (_, i) => i));
  const hv = gate ? thin(gate.series.t_s.map((t, i) => [t, gate.series.diff_s[i]!] as const)) : [];
  const gRun: { t: number; g: number; u: number }[] = [];
  if (g !== null && gU !== null && T0u !== null) {
    // Cumulative mean of the reduced periods up to each of ≤ 100 times; the systematic part of the budget is kept.
    const sysRel2 = Math.max(0, (gU / g) ** 2 - (2 * uStatRel) ** 2);
    const steps = Math.min(100, P0.length);
    let s = 0;
    let s2 = 0;
    let m = 0;
    let k0 = 0;
    for (let j = 1; j <= steps; j++) {
      const k1 = Math.floor((j * P0.length) / steps);
      for (; k0 < k1; k0++) if (keep[k0]) (s += P0[k0]!), (s2 += P0[k0]! ** 2), m++;
      if (m === 0) continue;
      const mean = s / m;
      const sdRel = m > 1 ? Math.sqrt(Math.max(0, s2 / m - mean * mean)) / mean / Math.sqrt(m) : 0;
      const gk = g * (T0mean! / mean) ** 2;
      gRun.push({ t: p.t[pIdx[k1 - 1]!]!, g: gk, u: gk * Math.sqrt(sysRel2 + 4 * sdRel * sdRel) });
    }
  }
  const plots: PlotSeries = {
    periodVsAmplitude: { amplitude_deg: pvIdx.map((k) => pAmp[k]! * DEG), period_s: pvIdx.map((k) => P[k]!) },
    amplitudeVsTime: { t_s: avIdx.map((i) => ampT[i]!), amplitude_deg: avIdx.map((i) => ampA[i]! * DEG) },
    halfPeriodAlternation: { t_s: hv.map((x) => x[0]), diff_s: hv.map((x) => x[1]) },
    clockResiduals: { host_s: thin(d.clock.residuals.host_s), residual_s: thin(d.clock.residuals.residual_s) },
    gRunning: { t_s: gRun.map((x) => x.t), g: gRun.map((x) => x.g), g_u: gRun.map((x) => x.u) },
    qVsAmplitude: damping && T0 !== null
      ? { amplitude_deg: damping.windows.map((w) => w.amplitude * DEG), Q: damping.windows.map((w) => qualityFactor({ a0: w.rate, a1: 0, a2: 0 }, w.amplitude, T0!)) }
      : { amplitude_deg: [], Q: [] },
  };

  let qU: number | null = null;
  if (damping && T0 !== null) {
    const qs = damping.windows.map((w) => (Math.PI * w.amplitude) / (T0! * w.rate)).filter((x) => Number.isFinite(x) && x > 0);
    qU = qs.length > 2 ? batchMeansStdError(qs) * (damping.Q / Math.max(median(qs), 1e-300)) : null;
  }
  const gateM = gate ? gate.offset_m : null;

  return {
    T0_s: finiteOrNull(T0u),
    T0_u_s: finiteOrNull(T0_u),
    g_m_s2: finiteOrNull(g),
    g_u_m_s2: finiteOrNull(gU),
    clock_ppm: d.clock.ppm,
    clock_u_ppm: d.clock.u_ppm,
    clock_source: d.clock.source,
    gate_offset_m: finiteOrNull(gateM),
    gate_offset_u_m: gate ? finiteOrNull(gate.offset_u_m) : null,
    B: law ? law.B : null,
    B_u: law ? law.B_u : null,
    C: law ? law.C : null,
    C_u: law ? law.C_u : null,
    amplitude_start_deg: ampA.length ? ampA[0]! * DEG : null,
    amplitude_end_deg: ampA.length ? ampA[ampA.length - 1]! * DEG : null,
    Q: damping ? damping.Q : null,
    damping_model: damping ? damping.best.model : null,
    damping_fits: damping ? damping.fits : [],
    passes: validCount,
    periods: P.length,
    counts: d.counts,
    budget,
    corrections: model ? model.lines : [],
    expected_g_m_s2: expected,
    g_diff_sigma: finiteOrNull(diffSigma),
    warnings,
    T0_fit_s: law ? law.T0 : null,
    B_theory: 1 / 16,
    C_theory: 11 / 3072,
    Q_u: finiteOrNull(qU),
    damping_tau_s: damping ? damping.tau_s : null,
    median_amplitude_deg: Number.isFinite(medA) ? medA * DEG : null,
    clock_drift_ppm_per_h: d.clock.drift_ppm_per_h,
    clock_span_s: d.clock.span_s,
    L_eff_m: model ? model.L_eff_m : null,
    amplitude_sensitivity: sens,
    settings: d.settings,
    line_rejections: d.lineRejections ?? {},
    swings,
    plots,
    run: d.run,
  };
}
