// Figure 6, hand timing baseline: a stopwatch over 10 swings with human reaction error per press, against the
// project's own T0 from the same 21 passes.
import { periodRatio } from '../../host/analysis/elliptic.ts';
import { Rng, simulateJournal } from '../../sim/index.ts';
import type { BenchContext, Benchmark } from './benchmark.ts';
import type { FigureResult, Row } from './report.ts';
import { benchScenario, simulateAndAnalyze } from './sim-analysis.ts';
import { mean, quantile, rms } from './stats.ts';

const SWINGS = 10;

/** Reaction error models per press (s). */
const PRESS_MODELS = [
  { name: 'stopwatch, σ 0.1 s per press', bias: 0, sd: 0.1, source: 'common practice, no source' },
  { name: 'stopwatch, σ 0.2 s per press', bias: 0, sd: 0.2, source: 'common practice, no source' },
  { name: 'stopwatch, 0.11 ± 0.07 s per press', bias: 0.11, sd: 0.07, source: 'Am. J. Phys. 87(2), 110 (2019): timekeepers, anticipated stimulus' }, // docs/references.md#ref-stopwatch
] as const;

interface Swing {
  /** True T0 error of the project's analysis (s), and its stated standard uncertainty. */
  readonly projectErr: number;
  readonly projectU: number | null;
  /** True mean period over the 10 swings reduced to zero amplitude with the true amplitude, minus true T0 (s). */
  readonly reducedTrueErr: number;
  readonly trueT0: number;
}

/** One seed: the first 21 passes of a run, timed by the project and (in `run`) by a stopwatch. */
function oneSeed(seed: number): Swing {
  const s = benchScenario('bench-day');
  const first = simulateJournal(s, { seed, durationS: 2 * SWINGS * 2.1 + 3 });
  for (const _ of first.lines) {
    // Run the simulation to the end so the truth is complete.
  }
  const { passes, swings, release_host_s: release } = first.truth;
  const mid = (i: number): number => (passes.enter_s[i]! + passes.exit_s[i]!) / 2;
  const last = 2 * SWINGS;
  // End the journal between pass 21's exit and pass 22's entry, so the analysis sees exactly the same swings.
  const durationS = release + (passes.exit_s[last]! + passes.enter_s[last + 1]!) / 2;
  const { result, truth } = simulateAndAnalyze(s, { seed, durationS });
  const amps = swings.t_s.map((t, i) => ({ t, a: Math.abs(swings.theta_rad[i]!) })).filter((x) => x.t > mid(0) && x.t < mid(last));
  const ratio = periodRatio(mean(amps.map((x) => x.a)));
  const trueT0 = truth.physics.T0_s;
  return {
    projectErr: result.T0_s === null ? NaN : result.T0_s - trueT0,
    projectU: result.T0_u_s,
    reducedTrueErr: (mid(last) - mid(0)) / SWINGS / ratio - trueT0,
    trueT0,
  };
}

async function run(ctx: BenchContext): Promise<FigureResult> {
  const seeds = ctx.quick ? 4 : 300;
  const runs: Swing[] = [];
  for (let seed = 1; seed <= seeds; seed++) {
    runs.push(oneSeed(seed));
    if (seed % 100 === 0) ctx.progress(`${seed}/${seeds} seeds`);
  }
  const project = runs.filter((r) => Number.isFinite(r.projectErr));
  const projectRms = rms(project.map((r) => r.projectErr));
  const T0 = runs[0]!.trueT0;
  const rows: Row[] = [];
  for (const [i, m] of PRESS_MODELS.entries()) {
    const rng = new Rng(500 + i);
    // The stopwatch starts and stops on a pass; the true interval is exact, so only the presses err.
    // The same amplitude reduction is granted to the stopwatch (with the true amplitude): its error is the presses alone.
    const hand = runs.map((r) => r.reducedTrueErr + (m.bias + m.sd * rng.normal() - (m.bias + m.sd * rng.normal())) / SWINGS);
    const handRms = rms(hand);
    rows.push({
      figure: `T0 error over ${SWINGS} swings, rms: project vs ${m.name}`,
      value: projectRms * 1e3,
      unit: 'ms',
      baselineName: m.name,
      baseline: handRms * 1e3,
      ratio: handRms / projectRms,
      note: `${seeds} seeds; in g (2δT/T): project ${((2 * projectRms) / T0 * 100).toExponential(2)} %, stopwatch ${((2 * handRms) / T0 * 100).toFixed(2)} %; press model: ${m.source}; ratio = stopwatch / project`,
    });
  }
  const us = project.map((r) => r.projectU).filter((u): u is number => u !== null);
  rows.push({
    figure: `project's stated u(T0) over ${SWINGS} swings (median)`,
    value: quantile(us, 0.5) * 1e3,
    unit: 'ms',
    baselineName: 'stopwatch σ 0.1 s per press, predicted',
    baseline: ((0.1 * Math.SQRT2) / SWINGS) * 1e3,
    ratio: (0.1 * Math.SQRT2) / SWINGS / quantile(us, 0.5),
    note: "21 s is too short to calibrate the board clock on the host, so the analysis assumes a ceramic resonator's ±0.5 % (rectangular): the stated u is that assumption, the error above is the simulated board's 35 ppm",
  });
  return { id: 'hand', title: 'hand timing baseline', rows, details: { seeds, projectRmsS: projectRms, projectErrS: project.map((r) => r.projectErr) } };
}

export const handTiming: Benchmark = { id: 'hand', title: 'hand timing baseline', run };
