// Figure 2, live: arrival → snapshot → frame latency, and CPU of the live store + ink view at a realistic line rate
// and at 100× that, against the pacing loop alone; plus the pipeline's own push + live() cost per line.
import { LIVE_HZ } from '../../host/tui/live-store.ts';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { REPO_ROOT, type BenchContext, type Benchmark } from './benchmark.ts';
import { runMeasured } from './child-stats.ts';
import { LONG_RUN_SCENARIO } from './journals.ts';
import type { FigureResult, Row } from './report.ts';
import { max, quantile } from './stats.ts';

/** History pushed before measuring, so each full-result recompute costs what it does an hour into a run. */
const PRELOAD_S = 3600;

interface ChildOut {
  readonly lines: number;
  readonly wallS: number;
  readonly cpuPct: number;
  readonly snapMs: number[];
  readonly frameMs: number[];
  readonly frames: number;
}

async function child(ctx: BenchContext, mode: 'view' | 'pace', speed: number, windowS: number): Promise<ChildOut> {
  ctx.progress(`${mode} at ${speed}× real time for ${windowS} s`);
  // Ink renders only the last frame when it thinks it runs in CI; the child must render as on a terminal.
  const env = { ...process.env };
  delete env.CI;
  const r = await runMeasured(process.execPath, [join(REPO_ROOT, 'bin', 'tsx-run.js'), join(REPO_ROOT, 'test', 'bench', 'live-child.ts'), mode, String(speed), String(windowS), String(PRELOAD_S), LONG_RUN_SCENARIO], { cwd: REPO_ROOT, env });
  const last = r.stdout.split('\n').reverse().find((l) => l.startsWith('{'));
  if (r.code !== 0 || !last) throw new Error(`live child failed: ${r.stderr.trim().split('\n').slice(-3).join(' / ')}`);
  return JSON.parse(last) as ChildOut;
}

/** Per-line cost of push + live() on the pipeline alone, against parsing the journal line only. */
function pipelineCost(quick: boolean): { pushLive: number[]; parse: number[]; resultMs: number } {
  const lines = [...simulateJournal(loadScenario(LONG_RUN_SCENARIO), { seed: 5, durationS: quick ? 300 : PRELOAD_S }).lines];
  const p = createRunPipeline();
  const pushLive: number[] = [];
  const parse: number[] = [];
  for (const line of lines) {
    const a = performance.now();
    const e = parseJournalLine(line);
    const b = performance.now();
    p.push(e);
    p.live();
    const c = performance.now();
    parse.push((b - a) * 1000);
    pushLive.push((c - a) * 1000);
  }
  let resultMs = Infinity;
  for (let i = 0; i < 3; i++) {
    const a = performance.now();
    p.result();
    resultMs = Math.min(resultMs, performance.now() - a);
  }
  return { pushLive, parse, resultMs };
}

const quick = (ctx: BenchContext): string => (ctx.quick ? '5 min' : `${PRELOAD_S / 3600} h`);

async function run(ctx: BenchContext): Promise<FigureResult> {
  const realistic = 1;
  const fast = 100;
  const windowS = ctx.quick ? 1 : 8;
  const paceS = ctx.quick ? 1 : 4;
  const cost = pipelineCost(ctx.quick);
  const rows: Row[] = [
    {
      figure: 'pipeline push + live() per line, p99',
      value: quantile(cost.pushLive, 0.99),
      unit: 'µs',
      baselineName: 'parsing the journal line only',
      baseline: quantile(cost.parse, 0.99),
      ratio: quantile(cost.pushLive, 0.99) / quantile(cost.parse, 0.99),
      note: `${cost.pushLive.length} lines of a 1 h run, in process; median ${quantile(cost.pushLive, 0.5).toFixed(1)} µs, max ${max(cost.pushLive).toFixed(0)} µs`,
    },
    {
      figure: `full result() over ${quick(ctx)} of history`,
      value: cost.resultMs,
      unit: 'ms',
      note: 'what each refresh of the full analysis in the live view costs (the store does it at up to 2 Hz)',
    },
  ];
  for (const speed of [realistic, fast]) {
    const view = await child(ctx, 'view', speed, windowS);
    const pace = await child(ctx, 'pace', speed, paceS);
    const rate = view.lines / view.wallS;
    const label = `${speed}× (${rate.toFixed(0)} lines/s, ${PRELOAD_S / 3600} h of history)`;
    rows.push({
      figure: `CPU of store + view, ${label}`,
      value: view.cpuPct,
      unit: '% of a core',
      baselineName: 'pacing loop alone',
      baseline: pace.cpuPct,
      ratio: view.cpuPct / Math.max(pace.cpuPct, 1e-9),
      target: '< 100 % (keeps up)',
      met: view.cpuPct < 100,
      note: `${view.frames} frames in ${view.wallS.toFixed(1)} s (view at up to 10 fps, full result at up to 2 Hz)`,
    });
    if (view.snapMs.length > 0) {
      rows.push({
        figure: `line arrival → snapshot, ${speed}×, p99`,
        value: quantile(view.snapMs, 0.99),
        unit: 'ms',
        target: `≤ ${1000 / LIVE_HZ} ms (design: the store publishes at ${LIVE_HZ} Hz)`,
        met: quantile(view.snapMs, 0.99) <= 1000 / LIVE_HZ,
        note: `${view.snapMs.length} lines; median ${quantile(view.snapMs, 0.5).toFixed(1)} ms, max ${max(view.snapMs).toFixed(1)} ms`,
      });
    }
    if (view.frameMs.length > 0) {
      rows.push({
        figure: `line arrival → frame written, ${speed}×, p99`,
        value: quantile(view.frameMs, 0.99),
        unit: 'ms',
        note: `median ${quantile(view.frameMs, 0.5).toFixed(1)} ms, max ${max(view.frameMs).toFixed(1)} ms`,
      });
    }
  }
  return { id: 'live', title: 'live latency and CPU', rows };
}

export const live: Benchmark = { id: 'live', title: 'live latency and CPU', run };
