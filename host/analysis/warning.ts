// What the analysis and the live view warn about, as data: a kind and its numbers, never words.
//
// The words (terminal summary, live view, report, the `text` of analyze --json) come from one table,
// host/output/warning-words.ts. The thresholds that decide a warning live here, once.

/**
 * What the sign of the gate offset is relative to: 'release' when the run recorded the release, so "the side the
 * bob was on before the first pass" is the side it was released from; null when the run joined mid-swing.
 */
export type GateSide = 'release' | null;

/** A warning of the analysis (and of the live view, for the kinds that depend on the time now). */
export type Warning =
  // The journal and the device
  | { readonly kind: 'boot-without-hello'; readonly boot: number; readonly hz: number }
  | { readonly kind: 'rig-line-unusable'; readonly detail: string }
  | { readonly kind: 'malformed-journal-lines'; readonly count: number }
  // The clock
  | { readonly kind: 'pps-unusable'; readonly pulses: number }
  | { readonly kind: 'clock-too-few-heartbeats' }
  | { readonly kind: 'clock-run-too-short'; readonly span_s: number; readonly min_span_s: number; readonly ppm: number; readonly u_ppm: number }
  | { readonly kind: 'clock-forced-short'; readonly span_s: number }
  | { readonly kind: 'clock-drift'; readonly drift_ppm_per_h: number }
  | { readonly kind: 'clock-foreign-rate'; readonly ratio: number }
  | { readonly kind: 'clock-nominal'; readonly u_ppm: number }
  | { readonly kind: 'clock-not-negligible'; readonly u_rel_clock: number; readonly u_rel_g: number }
  // Passes
  | { readonly kind: 'passes-rejected-transit'; readonly count: number }
  | { readonly kind: 'passes-rejected-timing'; readonly count: number }
  | { readonly kind: 'long-gaps'; readonly count: number; readonly segments: number }
  | { readonly kind: 'passes-unsequenced'; readonly count: number }
  | { readonly kind: 'passes-slow'; readonly count: number }
  | { readonly kind: 'periods-clipped'; readonly count: number }
  | { readonly kind: 'no-valid-passes' }
  | { readonly kind: 'no-full-period' }
  | { readonly kind: 'passes-without-amplitude'; readonly count: number; readonly well_clear: number }
  // Fits
  | { readonly kind: 'no-rig' }
  | { readonly kind: 'damping-too-few'; readonly count: number; readonly needed: number }
  | { readonly kind: 'no-measurable-decay'; readonly amplitude_min_deg: number; readonly amplitude_max_deg: number; readonly q_lower: number | null }
  | { readonly kind: 'period-law-unfit' }
  | { readonly kind: 'c-held' }
  | { readonly kind: 'gate-delay-prior'; readonly run_s: number | null; readonly run_u_s: number | null; readonly prior_s: number; readonly prior_u_s: number }
  | { readonly kind: 'gate-segments-aligned'; readonly segments: number }
  | { readonly kind: 'gate-offset'; readonly offset_m: number; readonly u_m: number; readonly side: GateSide }
  | { readonly kind: 'no-elevation' }
  | { readonly kind: 'one-beam-plane'; readonly turn_deg: number; readonly amplitude_low: number; readonly latitude_known: boolean }
  | { readonly kind: 'reversible-other-pivot'; readonly pivot: number; readonly other: number }
  // The live view: things that depend on the time now
  | { readonly kind: 'disconnected' }
  | { readonly kind: 'no-passes'; readonly silent_s: number; readonly periods: number; readonly why: 'blocked' | 'small-swing' | 'dying' | 'unknown'; readonly swing_mm?: number; readonly flag_mm?: number }
  | { readonly kind: 'heartbeats-missing'; readonly gap_s: number }
  | { readonly kind: 'room-reading-stale'; readonly age_s: number; readonly interval_s: number };

export type WarningKind = Warning['kind'];

/** Every threshold that decides a warning. */
export const WARN = {
  /** A gate this far from the lowest point (m), and clear of twice its uncertainty, is worth moving: common practice, no source. */
  gateOffset_m: 0.002,
  /** The clock calibration is not negligible when its share of u(g)/g exceeds this fraction of it. */
  clockShareOfU: 0.5,
  /** Silence for this many expected periods means the swing, the gate or the device needs a look. */
  silentPeriods: 3,
  /** Heartbeats missing for this many of their usual intervals (the same rule as the link's). */
  silentHeartbeats: 3,
  /** Room readings missing for this many of their intervals while heartbeats come (the heartbeats' rule). */
  silentRoomReadings: 3,
  /** An amplitude within this factor of the beam's half-angle barely clears the beam: common practice, no source. */
  dyingSwingFactor: 1.5,
  /** Amplitude bias (fraction low) from the swing plane turning from which a one-beam run is warned. */
  planeBias: 0.005,
} as const;
