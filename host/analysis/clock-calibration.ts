// Device clock rate against the host clock (lower envelope of one-sided USB latency) or against a 1 PPS input.
//
// Each heartbeat gives x = ticks/hz (nominal device seconds) and the host time h at which its line began to be
// sent (its LF's arrival less the line's wire time, host/pipeline/line-wire-time.ts: the line grows during a run,
// and its wire time would read as a rate). With the true tick rate hz·(1 + p), h = offset + x/(1 + p) + latency,
// latency ≥ 0 and one-sided (USB polling, OS scheduling). A plain least-squares line through all points is biased
// by latency that changes over the run and is spoilt by long stalls, so we fit the lower envelope instead:
// minimum-delay filtering (the minimum of y = h − x within windows of the run) followed by a line through the
// minima with upward outliers removed. This is the minimum-delay idea of S. B. Moon, P. Skelly, D. Towsley,
// "Estimation and removal of clock skew from network delay measurements", IEEE INFOCOM 1999 (from memory), done
// with window minima so that the scatter of the minima gives an uncertainty.
import { linearFit } from './least-squares.ts';
import { robustSigma } from './stats.ts';

/** Heartbeats of one boot: nominal device seconds and host seconds, both increasing. */
export interface BootHeartbeats {
  readonly boot: number;
  readonly deviceS: ArrayLike<number>;
  readonly hostS: ArrayLike<number>;
}

/** The clock rate estimate. */
export interface ClockRate {
  /** Rate error of the device clock, ppm: true ticks per second = hz·(1 + ppm·1e-6). */
  readonly ppm: number;
  readonly u_ppm: number;
  /** Change of the rate over the run, ppm per hour (null when the run is too short to tell). */
  readonly drift_ppm_per_h: number | null;
  readonly drift_u_ppm_per_h: number | null;
  /** Host seconds spanned by the heartbeats used. */
  readonly span_s: number;
  readonly windows: number;
  /** Window minima kept, with their residual about the fitted line (for plots). */
  readonly residuals: { readonly host_s: number[]; readonly residual_s: number[] };
}

interface Minimum {
  readonly boot: number;
  readonly x: number;
  readonly y: number;
  readonly h: number;
}

/**
 * Each window's lowest y = h − k·x: with k near the rate, where in its window a minimum falls is down to the latency.
 * A boot's windows tile its span exactly (about `windowS` each): a last window of a beat or two would add a
 * minimum at the very end, whose leverage tilts the line where the rate drifts (+0.06 ppm at 20 ppm/h over 20 min).
 */
function windowMinima(boots: readonly BootHeartbeats[], windowS: number, k: number): Minimum[] {
  const out: Minimum[] = [];
  for (const b of boots) {
    const n = b.deviceS.length;
    if (n === 0) continue;
    const x0 = b.deviceS[0]!;
    const len = b.deviceS[n - 1]! - x0;
    const windows = Math.max(1, Math.round(len / windowS));
    let cur = -1;
    let best: Minimum | null = null;
    for (let i = 0; i < n; i++) {
      const x = b.deviceS[i]!;
      const y = b.hostS[i]! - k * x;
      const w = len > 0 ? Math.min(windows - 1, Math.floor(((x - x0) / len) * windows)) : 0;
      if (w !== cur) {
        if (best) out.push(best);
        cur = w;
        best = null;
      }
      if (!best || y < best.y) best = { boot: b.boot, x, y, h: b.hostS[i]! };
    }
    if (best) out.push(best);
  }
  return out;
}

/** Pooled fit with one intercept per boot: y = a_boot + β·x (+ γ·x² when quadratic). */
function pooledFit(ms: readonly Minimum[], quadratic: boolean) {
  const boots = [...new Set(ms.map((m) => m.boot))];
  const xBar = new Map<number, number>();
  for (const b of boots) {
    const xs = ms.filter((m) => m.boot === b);
    xBar.set(b, xs.reduce((s, m) => s + m.x, 0) / xs.length);
  }
  const basis: ((i: number) => number)[] = boots.map((b) => (i: number) => (ms[i]!.boot === b ? 1 : 0));
  basis.push((i) => ms[i]!.x - xBar.get(ms[i]!.boot)!);
  if (quadratic) basis.push((i) => (ms[i]!.x - xBar.get(ms[i]!.boot)!) ** 2);
  const fit = linearFit(ms.length, (i) => ms[i]!.y, basis);
  return fit ? { fit, nb: boots.length, xBar, boots } : null;
}

/**
 * The lower envelope's line y = h − k·x = a_boot + β·x through window minima with upward outliers removed, so that
 * dh/dx = k + β; null when too few windows remain.
 */
function envelopeFit(boots: readonly BootHeartbeats[], windowS: number, k: number) {
  let ms = windowMinima(boots, windowS, k);
  // Remove windows whose minimum sits far above the envelope (a window where every line came late), twice.
  for (let pass = 0; pass < 2; pass++) {
    const pf = pooledFit(ms, false);
    if (!pf || pf.fit.dof < 2) return null;
    const res = ms.map((m) => m.y - predict(pf, m, false));
    const sig = Math.max(robustSigma(res), 1e-7);
    ms = ms.filter((_, i) => res[i]! < 4 * sig);
  }
  const pf = pooledFit(ms, false);
  if (!pf || pf.fit.dof < 2) return null;
  return { ms, pf, beta: pf.fit.params[pf.nb]!, uBeta: Math.sqrt(pf.fit.cov[pf.nb]![pf.nb]!) };
}

/** Estimates the device clock rate from heartbeats; null when fewer than 4 windows with 3 beats each are available. */
export function clockRateFromHost(boots: readonly BootHeartbeats[]): ClockRate | null {
  let span = 0;
  let beats = 0;
  for (const b of boots) {
    const n = b.deviceS.length;
    beats += n;
    if (n > 1) span += b.deviceS[n - 1]! - b.deviceS[0]!;
  }
  if (beats < 12 || !(span > 0)) return null;
  const spacing = span / Math.max(1, beats - boots.length);
  const windowS = Math.max(5 * spacing, span / 48);
  // Minima of h − x sit at one end of every window when the rate is off (3000 ppm: 75 ms over 25 s, against ~1 ms
  // of latency), so they sample the run half a window late, and a drifting rate came out as the rate there
  // (+0.13 ppm at 20 ppm/h over 20 minutes). The minima of h − x/(1 + ppm) from a first fit do not lean.
  const first = envelopeFit(boots, windowS, 1);
  if (!first) return null;
  const k = 1 + first.beta;
  const env = envelopeFit(boots, windowS, k);
  if (!env) return null;
  const { ms, pf } = env;
  const slope = k + env.beta;
  const ppm = (1 / slope - 1) * 1e6;
  const u_ppm = (env.uBeta / slope ** 2) * 1e6;
  let drift: number | null = null;
  let driftU: number | null = null;
  if (span >= 1800 && ms.length >= 8) {
    const q = pooledFit(ms, true);
    if (q && q.fit.dof >= 2) {
      const iq = q.nb + 1;
      // rate(x) ≈ −(β + 2γx): d(ppm)/dt = −2γ·1e6 per second.
      drift = -2 * q.fit.params[iq]! * 1e6 * 3600;
      driftU = 2 * Math.sqrt(q.fit.cov[iq]![iq]!) * 1e6 * 3600;
    }
  }
  return {
    ppm,
    u_ppm,
    drift_ppm_per_h: drift,
    drift_u_ppm_per_h: driftU,
    span_s: span,
    windows: ms.length,
    residuals: { host_s: ms.map((m) => m.h), residual_s: ms.map((m) => m.y - predict(pf, m, false)) },
  };
}

function predict(pf: NonNullable<ReturnType<typeof pooledFit>>, m: Minimum, quadratic: boolean): number {
  const bi = pf.boots.indexOf(m.boot);
  const dx = m.x - pf.xBar.get(m.boot)!;
  return pf.fit.params[bi]! + pf.fit.params[pf.nb]! * dx + (quadratic ? pf.fit.params[pf.nb + 1]! * dx * dx : 0);
}

/**
 * Host-clock offset of each boot for a given rate: the lower envelope min(h − x/(1 + p)), so that
 * host ≈ offset + ticks/(hz(1 + p)) joins the boots' timebases on the host clock.
 */
export function bootOffsets(boots: readonly BootHeartbeats[], ppm: number): Map<number, number> {
  const k = 1 / (1 + ppm * 1e-6);
  return bootOffsetsWith(boots, (_, x) => x * k);
}

/** The same lower envelope for any map of nominal device seconds to seconds of a boot (a tracked rate). */
export function bootOffsetsWith(boots: readonly BootHeartbeats[], seconds: (boot: number, x: number) => number): Map<number, number> {
  const out = new Map<number, number>();
  for (const b of boots) {
    let best = Infinity;
    for (let i = 0; i < b.deviceS.length; i++) best = Math.min(best, b.hostS[i]! - seconds(b.boot, b.deviceS[i]!));
    if (Number.isFinite(best)) out.set(b.boot, best);
  }
  return out;
}

/** Rising edges of a 1 PPS input in one boot, in ticks. */
export interface BootPps {
  readonly boot: number;
  readonly ticks: ArrayLike<number>;
}

/**
 * Tick rate from a 1 PPS reference: ticks_i = t0 + f·n_i with n_i the whole seconds since the first pulse
 * (counted with a rate first taken from the median spacing, so a resonator thousands of ppm off still counts right).
 * Returns null with fewer than 5 pulses or when the pulses are not about one second apart.
 */
export function clockRateFromPps(pps: readonly BootPps[], hz: number): (Omit<ClockRate, 'drift_ppm_per_h' | 'drift_u_ppm_per_h'> & { pulses: number }) | null {
  const rows: { boot: number; n: number; t: number }[] = [];
  for (const b of pps) {
    const m = b.ticks.length;
    if (m < 2) continue;
    const diffs: number[] = [];
    for (let i = 1; i < m; i++) diffs.push(b.ticks[i]! - b.ticks[i - 1]!);
    diffs.sort((a, c) => a - c);
    const f0 = diffs[diffs.length >> 1]!;
    if (!(Math.abs(f0 / hz - 1) < 0.02)) continue;
    let last = -1;
    for (let i = 0; i < m; i++) {
      const n = Math.round((b.ticks[i]! - b.ticks[0]!) / f0);
      if (n === last) continue;
      last = n;
      rows.push({ boot: b.boot, n, t: b.ticks[i]! - b.ticks[0]! });
    }
  }
  if (rows.length < 5) return null;
  const boots = [...new Set(rows.map((r) => r.boot))];
  const basis: ((i: number) => number)[] = boots.map((b) => (i: number) => (rows[i]!.boot === b ? 1 : 0));
  basis.push((i) => rows[i]!.n);
  const fit = linearFit(rows.length, (i) => rows[i]!.t, basis);
  if (!fit) return null;
  const f = fit.params[boots.length]!;
  const uf = Math.sqrt(fit.cov[boots.length]![boots.length]!);
  const span = rows.reduce((s, r) => Math.max(s, r.n), 0);
  return {
    ppm: (f / hz - 1) * 1e6,
    u_ppm: Math.max((uf / hz) * 1e6, 1e-6),
    span_s: span,
    windows: rows.length,
    pulses: rows.length,
    residuals: { host_s: [], residual_s: [] },
  };
}
