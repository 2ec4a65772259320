// How a live state is compared with the full result of the same entries (pipeline-live-estimate and
// pipeline-live-state tests): the tolerances with what was measured when they were written, and the checks.
import { expect } from 'vitest';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult, SwingRow } from '../../host/analysis/result.ts';
import type { PassStatus } from '../../host/analysis/passes.ts';
import type { RunPipeline } from '../../host/pipeline/run-pipeline.ts';
import type { LiveState } from '../../host/pipeline/live-state.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

/**
 * Tolerances, each with the largest difference measured on the bundled scenarios (seed 1) when it was written:
 * - the live clock is chosen again only after the heartbeats grew by 0.1 %: its rate lags the full result's by
 *   up to 0.013 ppm (plane-anisotropic-push at 90 %), so CLOCK_PPM = 0.05 ppm, and periods move by that in 1e-6;
 *   or by up to twice the rate's own u where the few heartbeats more move the fit's windows (their length is the
 *   span/48) and so its minima: 0.064 ppm with u 0.051 at 64 % of plane-anisotropic-push, whose minima scatter by
 *   ±0.3 ms under the two beams' lines;
 * - with the same clock and the same passes, periods and half-periods are the same arithmetic (0 measured; 1.2e-8
 *   where the clock lagged): PERIOD_REL = 1e-7;
 * - amplitudes use T0 from the window (and a two-beam run the window's pairing ω0): ≤ 4.5e-6 on one beam, 3.9e-5
 *   on two beams (plane-anisotropic-push), 2.5e-5 where the window has only slow passes: AMPLITUDE_REL = 1e-4;
 * - a pass is slow (amplitude, no period) when its transit exceeds a third of the median half-period, taken from
 *   the window live and from the run in the full result: within SLOW_BAND = ±10 % of that threshold (a gate offset
 *   makes the half-periods alternate by ±5 % at the end of club-resonator) the two may disagree;
 * - passes are matched by time within MATCH_S = 1 ms (a lagging clock moves absolute times by ~1e-5 s at 5 h);
 * - two beams: the plane stage runs on the window, its ω0 from the window's paired passes (second order in the
 *   azimuth and b): azimuth ≤ 2.0e-5° (plane-anisotropic-push; ≤ 1.8e-6° on the others), AZIMUTH_DEG = 1e-4;
 *   signed minor axis ≤ 5.3e-9 m (plane-anisotropic-push; ≤ 7e-11 m on the others), MINOR_M = 5e-8; semi-major
 *   axis ≤ 9.0e-5 relative (plane-anisotropic-push; ≤ 4.8e-6 on the others), SEMI_MAJOR_REL = 3e-4.
 */
const CLOCK_PPM = 0.05;
const PERIOD_REL = 1e-7;
export const AMPLITUDE_REL = 1e-4;
const SLOW_BAND = 0.1;
const MATCH_S = 1e-3;
const AZIMUTH_DEG = 1e-4;
const MINOR_M = 5e-8;
const SEMI_MAJOR_REL = 3e-4;
/** Where the live state is compared: fractions of the journal's entries. */
export const POINTS = [0.1, 0.37, 0.64, 0.9, 1];

const FLAG_STATUS: Readonly<Record<string, PassStatus>> = { 'rejected:transit': 'rejected-transit', 'rejected:timing': 'rejected-timing', unsequenced: 'unsequenced' };
export const statusOf = (row: SwingRow): PassStatus => row.flags.map((f) => FLAG_STATUS[f]).find((s) => s !== undefined) ?? 'valid';
export const rel = (a: number, b: number): number => Math.abs(a / b - 1);

function medianHalf(r: AnalysisResult): number {
  const h = r.swings.map((s) => s.half_period_s).filter((x): x is number => x !== null).sort((a, b) => a - b);
  return h[h.length >> 1]!;
}

/** Two beams: the live plane at each pass is the batch's plane stage at that pass (rows and plot series); returns the passes compared. */
export function comparePlane(l: LiveState, r: AnalysisResult, where: string): { passes: number; semiMajor: number } {
  expect(l.plane === null, where).toBe(r.plane === null || r.plane === undefined);
  if (!l.plane) return { passes: 0, semiMajor: 0 };
  let semiMajor = 0;
  const pl = l.plane;
  const series = r.plots.plane!;
  for (let i = 0; i < pl.t_s.length; i++) {
    const row = r.swings.find((s) => Math.abs(s.t_s - pl.t_s[i]!) < MATCH_S);
    expect(row?.azimuth_deg, `${where}: plane at ${pl.t_s[i]} s`).toBeTypeOf('number');
    const dAz = Math.abs(pl.azimuth_deg[i]! - row!.azimuth_deg!);
    const dB = Math.abs(pl.minor_axis_m[i]! - row!.minor_axis_m!);
    expect(dAz, where).toBeLessThanOrEqual(AZIMUTH_DEG);
    expect(dB, where).toBeLessThanOrEqual(MINOR_M);
    const k = series.t_s.findIndex((t) => Math.abs(t - pl.t_s[i]!) < MATCH_S);
    // The plot series is thinned to 2000 points on long runs: the semi-major axis where the pass is in it.
    if (k < 0) continue;
    expect(rel(pl.semi_major_m[i]!, series.semi_major_m[k]!), where).toBeLessThanOrEqual(SEMI_MAJOR_REL);
    semiMajor++;
  }
  return { passes: pl.t_s.length, semiMajor };
}

/** Compares one live snapshot with the full result of the same entries; returns what the checks looked at. */
export function compare(l: LiveState, r: AnalysisResult, where: string): { shown: number } {
  expect(l.clock.source, where).toBe(r.clock_source);
  expect(Math.abs(l.clock.ppm - r.clock_ppm!), where).toBeLessThanOrEqual(Math.max(CLOCK_PPM, 2 * r.clock_u_ppm!));
  const valid = r.swings.filter((s) => statusOf(s) === 'valid');
  const near = (t: number): SwingRow | undefined => valid.find((s) => Math.abs(s.t_s - t) < MATCH_S);
  const slowAt = medianHalf(r) / 3;
  const rc = l.recent;
  // Every pass the live state calls valid is valid in the full result, and none in between is missing.
  if (rc.t_s.length) expect(valid.filter((s) => s.t_s > rc.t_s[0]! - MATCH_S && s.t_s < rc.t_s.at(-1)! + MATCH_S).length, where).toBe(rc.t_s.length);
  for (let i = 0; i < rc.t_s.length; i++) {
    const row = near(rc.t_s[i]!);
    expect(row, `${where}: pass at ${rc.t_s[i]} s`).toBeDefined();
    const p = rc.period_s[i]!;
    if (p !== null && row!.period_s !== null) expect(rel(p, row!.period_s), where).toBeLessThanOrEqual(PERIOD_REL);
    else if ((p === null) !== (row!.period_s === null)) expect(Math.abs(row!.transit_s / slowAt - 1), `${where}: slow at ${row!.t_s}`).toBeLessThan(SLOW_BAND);
    expect(rc.amplitude_deg[i] === null, where).toBe(row!.amplitude_deg === null);
    if (row!.amplitude_deg !== null) expect(rel(rc.amplitude_deg[i]!, row!.amplitude_deg), where).toBeLessThanOrEqual(AMPLITUDE_REL);
  }
  // The latest swing is the full result's last valid row; the newest pass has the same status in both.
  const last = valid.at(-1)!;
  expect(rc.t_s.length, `${where}: the latest valid swing is in view`).toBeGreaterThan(0);
  expect(Math.abs(rc.t_s.at(-1)! - last.t_s), where).toBeLessThan(MATCH_S);
  expect(l.amplitudeDeg === null ? null : rel(l.amplitudeDeg, last.amplitude_deg!) <= AMPLITUDE_REL, where).toBe(last.amplitude_deg === null ? null : true);
  if (l.periodS !== null && last.period_s !== null) expect(rel(l.periodS, last.period_s), where).toBeLessThanOrEqual(PERIOD_REL);
  if (l.halfPeriodsS[1] !== null) expect(rel(l.halfPeriodsS[1], last.half_period_s!), where).toBeLessThanOrEqual(PERIOD_REL);
  if (l.periodS !== null && l.halfPeriodsS[0] !== null) expect(rel(l.halfPeriodsS[0] + l.halfPeriodsS[1]!, l.periodS), where).toBeLessThan(1e-12);
  expect(l.lastPass?.status, where).toBe(statusOf(r.swings.at(-1)!));
  return { shown: rc.t_s.length };
}

export function entriesOf(name: string): JournalEntry[] {
  return [...simulateJournal(loadScenario(name), { seed: 1 }).lines].map(parseJournalLine);
}

/** Pushes entries [from, to), asking for the live state every `every` entries as a live view would. */
export function feed(p: RunPipeline, entries: readonly JournalEntry[], from: number, to: number, every = 40): void {
  for (let k = from; k < to; k++) {
    p.push(entries[k]!);
    if (k % every === 0) p.live();
  }
}
