// Figure "start": how long a command takes from the shell, against a bare `node -e 0` in the same run.
// Rounds interleave the commands so that load on a shared machine hits them alike; each figure is the best
// (smallest) wall time over the rounds, the least disturbed one. The sources through tsx (the dev path,
// and how every command started before the bundle) are measured beside the bundle.
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { NotMeasured, REPO_ROOT, type BenchContext, type Benchmark } from './benchmark.ts';
import { runMeasured, type ChildStats } from './child-stats.ts';
import { LONG_RUN_SCENARIO, simulatedJournal } from './journals.ts';
import type { FigureResult, Row } from './report.ts';

const CLI = join(REPO_ROOT, 'bin', 'halfswing.js');
const BUNDLE = join(REPO_ROOT, 'dist', 'halfswing.js');
const TARGET_HELP = 1.6;
const TARGET_ANALYZE = 3;

async function run(ctx: BenchContext): Promise<FigureResult> {
  if (!existsSync(BUNDLE)) throw new NotMeasured('dist/ is missing: run npm run build');
  const ten = await simulatedJournal(ctx, LONG_RUN_SCENARIO, 600);
  const bundled = { ...process.env };
  delete bundled.HALFSWING_DEV;
  const dev = { ...bundled, HALFSWING_DEV: '1' };
  const commands: Record<string, { args: string[]; env: NodeJS.ProcessEnv }> = {
    node: { args: ['-e', '0'], env: bundled },
    help: { args: [CLI, '--help'], env: bundled },
    analyze: { args: [CLI, 'analyze', ten.file, '--json'], env: bundled },
    helpDev: { args: [CLI, '--help'], env: dev },
    analyzeDev: { args: [CLI, 'analyze', ten.file, '--json'], env: dev },
  };
  const best: Record<string, ChildStats> = {};
  const rounds = ctx.quick ? 1 : 15;
  for (let r = 0; r < rounds; r++) {
    for (const [name, c] of Object.entries(commands)) {
      const s = await runMeasured(process.execPath, c.args, { cwd: REPO_ROOT, env: c.env });
      if (s.code !== 0) throw new Error(`${name} exited ${s.code}: ${s.stderr.trim().split('\n')[0] ?? ''}`);
      if (!best[name] || s.wallS < best[name].wallS) best[name] = s;
    }
  }
  const base = best.node!.wallS;
  const row = (figure: string, name: string, target?: number): Row => ({
    figure,
    value: best[name]!.wallS,
    unit: 's',
    baselineName: 'node -e 0',
    baseline: base,
    ratio: best[name]!.wallS / base,
    ...(target !== undefined ? { target: `≤ ${target}× node -e 0`, met: best[name]!.wallS / base <= target } : {}),
    note: `best of ${rounds} interleaved rounds; CPU ${best[name]!.cpuS?.toFixed(3) ?? '—'} s vs ${best.node!.cpuS?.toFixed(3) ?? '—'} s for node -e 0`,
  });
  return {
    id: 'start',
    title: 'command start, bundle and sources',
    rows: [
      row('halfswing --help (bundle)', 'help', TARGET_HELP),
      row(`halfswing analyze --json, 10 min journal (${ten.lines} lines, bundle)`, 'analyze', TARGET_ANALYZE),
      row('halfswing --help (sources through tsx, HALFSWING_DEV=1)', 'helpDev'),
      row('halfswing analyze --json, 10 min (sources through tsx)', 'analyzeDev'),
    ],
  };
}

export const startup: Benchmark = { id: 'start', title: 'command start, bundle and sources', run };
