// Picks the device clock correction for a run: a given ppm, the nominal rate, a 1 PPS input, or the host clock.
import { clockRateFromHost, clockRateFromPps, type BootHeartbeats, type BootPps } from '../analysis/clock-calibration.ts';
import type { ClockApplied } from '../analysis/passes.ts';
import { meanExcursion, trackClockRate } from '../analysis/clock-track.ts';
import type { Warning } from '../analysis/warning.ts';

/** What the user asked for: a mode, a rate error in ppm, or nothing (auto: PPS if present, else host if long enough). */
export type ClockOption = 'host' | 'pps' | 'nominal' | number | undefined;

/** Host calibration over less than this is not trusted by default (s). */
export const MIN_HOST_SPAN_S = 300;
/**
 * Standard uncertainty assumed for an uncalibrated board clock: a ceramic resonator's ±0.5 % initial tolerance
 * (Murata CERALOCK CSTLS catalogue, docs/references.md#ref-clock-sources) as a rectangular distribution, 0.5 %/√3.
 */
export const NOMINAL_CLOCK_U_PPM = 5000 / Math.sqrt(3);

/**
 * Largest rate error of a board's clock against the host: a 16 MHz ceramic resonator is ±0.5 % initially and ±0.2 %
 * over temperature (docs/references.md#ref-clock-sources); 2 % leaves a wide margin. A host fit beyond it is
 * no clock error: device and host count different seconds (a simulator on a pty at --speed 5 runs 5 device
 * seconds per host second), and the lower envelope of host − device time, which joins boots on the host clock,
 * then sits at the run's last heartbeat: pass times came out minutes before the start.
 */
export const MAX_CLOCK_ERROR_PPM = 20_000;

const none = { host_s: [] as number[], residual_s: [] as number[] };

/** Chooses and computes the clock correction; warnings explain fallbacks. */
export function chooseClock(
  option: ClockOption,
  beats: readonly BootHeartbeats[],
  pps: readonly BootPps[],
  hz: number,
  warnings: Warning[],
): ClockApplied {
  if (typeof option === 'number') return { source: 'given', ppm: option, u_ppm: 0, measured: false, drift_ppm_per_h: null, span_s: null, residuals: none };
  const nominal = (): ClockApplied => ({ source: 'nominal', ppm: 0, u_ppm: NOMINAL_CLOCK_U_PPM, measured: false, drift_ppm_per_h: null, span_s: null, residuals: none });
  if (option === 'nominal') return nominal();
  const pulses = pps.reduce((s, b) => s + b.ticks.length, 0);
  if (option === 'pps' || (option === undefined && pulses >= 5)) {
    const r = clockRateFromPps(pps, hz);
    if (r) return { source: 'pps', ppm: r.ppm, u_ppm: r.u_ppm, measured: true, drift_ppm_per_h: null, span_s: r.span_s, residuals: none };
    if (option === 'pps') warnings.push({ kind: 'pps-unusable', pulses });
  }
  const h = clockRateFromHost(beats);
  if (h && Math.abs(h.ppm) > MAX_CLOCK_ERROR_PPM) {
    const ratio = 1 + h.ppm * 1e-6;
    warnings.push({ kind: 'clock-foreign-rate', ratio });
    return { ...nominal(), foreign_rate: ratio };
  }
  if (!h) {
    warnings.push({ kind: 'clock-too-few-heartbeats' });
    return nominal();
  }
  if (h.span_s < MIN_HOST_SPAN_S && option !== 'host') {
    warnings.push({ kind: 'clock-run-too-short', span_s: h.span_s, min_span_s: MIN_HOST_SPAN_S, ppm: h.ppm, u_ppm: h.u_ppm });
    return nominal();
  }
  if (h.span_s < MIN_HOST_SPAN_S) warnings.push({ kind: 'clock-forced-short', span_s: h.span_s });
  if (h.drift_ppm_per_h !== null && h.drift_u_ppm_per_h !== null && Math.abs(h.drift_ppm_per_h) > 3 * h.drift_u_ppm_per_h && Math.abs(h.drift_ppm_per_h) * (h.span_s / 3600) > 1)
    warnings.push({ kind: 'clock-drift', drift_ppm_per_h: h.drift_ppm_per_h });
  const host: ClockApplied = { source: 'host', ppm: h.ppm, u_ppm: h.u_ppm, measured: true, drift_ppm_per_h: h.drift_ppm_per_h, span_s: h.span_s, residuals: h.residuals };
  return withTrack(host, beats);
}

/** The host fit with the rate tracked through the run when the heartbeats show it moving (clock-track.ts). */
function withTrack(host: ClockApplied, beats: readonly BootHeartbeats[]): ClockApplied {
  const track = trackClockRate(beats, host.ppm);
  if (!track) return host;
  const m = meanExcursion(track, track.from_s, track.to_s);
  return { ...host, ppm: (track.k0 * (1 + m.e) - 1) * 1e6, u_ppm: track.k0 * m.u * 1e6, track };
}

/**
 * When the automatic choice moves (or moved) from the nominal rate to the host-clock fit: the host time (s) at
 * which the heartbeats span MIN_HOST_SPAN_S, the way `chooseClock` measures the span (device seconds, summed over
 * boots). While they span less, the time is projected from the last heartbeat (one device second per host second).
 * Null without heartbeats.
 */
export function hostCalibrationStart(beats: readonly BootHeartbeats[]): number | null {
  let span = 0;
  let lastHost: number | null = null;
  for (const b of beats) {
    const n = b.deviceS.length;
    for (let i = 1; i < n; i++) if (span + b.deviceS[i]! - b.deviceS[0]! >= MIN_HOST_SPAN_S) return b.hostS[i]!;
    if (n > 1) span += b.deviceS[n - 1]! - b.deviceS[0]!;
    if (n > 0) lastHost = b.hostS[n - 1]!;
  }
  return lastHost === null ? null : lastHost + (MIN_HOST_SPAN_S - span);
}
