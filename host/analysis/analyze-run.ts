// The analysis as a composition of pure stages (host/analysis/stages/): passes → periods → amplitudes and the
// reduction to zero amplitude → T0 line fit → damping → corrections → uncertainty budget → result.
import { gateOffset } from './gate-offset.ts';
import { gateSideOf } from './gate-side.ts';
import type { RunData } from './passes.ts';
import { fitPeriodLaw } from './period-law.ts';
import type { AnalysisResult } from './result.ts';
import { sensitivityAtMedian } from './stages/amplitudes.ts';
import { uncertaintyBudget } from './stages/budget.ts';
import { correctT0, expectedGravity } from './stages/corrections.ts';
import { decayOf } from './stages/decay.ts';
import { derivedUncertainty } from './stages/derived-uncertainty.ts';
import { delayWarnings, reduceWithDelay } from './stages/gate-delay.ts';
import { roomStage } from './stages/environment.ts';
import { findPeriods } from './stages/periods.ts';
import { plotSeries } from './stages/plots.ts';
import { roomAtTimes } from './room-at-pass.ts';
import { assembleResult } from './stages/result.ts';
import { swingRows } from './stages/swing-rows.ts';
import { lineT0 } from './stages/t0-line.ts';
import { analysisWarnings } from './stages/warnings.ts';

export type { ClockApplied, RunData, SequencedPasses } from './passes.ts';

/** Runs the analysis; total over partial data (nulls and warnings, never throws for thin data). */
export function analyzeRun(d: RunData): AnalysisResult {
  const { rig, passes, clock } = d;
  const periods = findPeriods(passes);
  // The sensor's on/off delay difference: assumed 0 ± u (common practice, no source), then calibrated from the run.
  const prior = { s: 0, u: d.delayDifferenceU_s ?? 5e-6 };
  const { reduction, delay } = reduceWithDelay(passes, periods, rig, prior);
  // With room readings: T0 at the reference temperature, the length and air density there (stages/environment.ts).
  const room = roomStage(d.room, passes, periods, reduction, rig, prior.u, d.clock.track);
  const { T0, line } = room.t0 ?? lineT0(passes, periods, reduction, rig);
  const omega0 = T0 !== null ? (2 * Math.PI) / T0 : NaN;
  // The damping comes before the corrections: its Q sizes the damping correction of T0.
  const decay = decayOf(passes, reduction.amp, T0);
  const law = fitPeriodLaw(periods.P, reduction.pAmp);
  const gate =
    rig && T0 !== null
      ? gateOffset({ index: passes.index, segment: passes.segment, t: passes.td, tPlot: passes.t, amplitude: reduction.amp.map((v, c) => (periods.slow[c] ? NaN : v)) }, omega0, rig.flag_width_m, rig.length_m)
      : null;
  const corrected = correctT0(room.rig, T0, decay.damping ? decay.damping.Q : null);
  const budget = uncertaintyBudget({ rig: room.rig, room, passes, periods, reduction, line, T0, corrected, clock, delay: delay ?? { difference_s: prior.s, difference_u_s: prior.u, statistical_u_s: prior.u, width_shift_s: 0, source: 'prior' } });
  const derivedU = derivedUncertainty({ rig, passes, periods, reduction, decay, law, gate, delay, T0 });
  const gateSide = gate ? gateSideOf(d.quietBeforeFirstPass_s, passes) : null;
  const warnings = [...d.warnings, ...analysisWarnings({ rig, passes, periods, reduction, T0, decay, law, gate, gateSide, corrected, budget, clock }), ...delayWarnings(delay)];
  return assembleResult(d, {
    periods,
    decay,
    law,
    gate,
    delay,
    derivedU,
    gateSide,
    corrected,
    budget,
    expected: expectedGravity(rig),
    sensitivity: sensitivityAtMedian(passes.transit, reduction.amp, decay.median, rig, omega0),
    warnings,
    swings: d.rows === false ? [] : swingRows(passes, periods, reduction, rig !== null, d.plane, d.room?.length ? roomAtTimes(d.room, passes.t) : null),
    environment: room.environment,
    plots: plotSeries(passes, periods, reduction, decay, gate, clock, T0, { g: corrected.g, g_u: budget.g_u, statRel: budget.statRel, T0mean: reduction.T0mean }, d.plane, d.room),
  });
}
