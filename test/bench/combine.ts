// Figure "combine": `halfswing combine --json` of two 20-minute journals (the reversible bar about both edges, and
// one bob at two lengths, whose fixed point reduces each journal again), against `analyze --json` of one of the same
// journals in the same run. Rounds interleave the commands; each figure is the best wall time over the rounds.
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadSession } from '../../sim/outlets/scenario-files.ts';
import { sessionRuns } from '../../sim/session.ts';
import { simulateJournal } from '../../sim/simulate.ts';
import { NotMeasured, REPO_ROOT, type BenchContext, type Benchmark } from './benchmark.ts';
import { runMeasured, type ChildStats } from './child-stats.ts';
import type { FigureResult, Row } from './report.ts';

const BUNDLE = join(REPO_ROOT, 'dist', 'halfswing.js');

/** The journals of a bundled session (seed 1), written into the work folder. */
function sessionJournals(ctx: BenchContext, session: string, durationS: number): { files: string[]; lines: number } {
  const { runs } = sessionRuns(loadSession(session), 1);
  let lines = 0;
  const files = runs.map((r) => {
    const out = [...simulateJournal(r.scenario, { seed: r.seed, durationS }).lines];
    lines += out.length;
    const file = join(ctx.workDir, `${r.name}.journal`);
    writeFileSync(file, `${out.join('\n')}\n`);
    return file;
  });
  return { files, lines };
}

async function run(ctx: BenchContext): Promise<FigureResult> {
  if (!existsSync(BUNDLE)) throw new NotMeasured('dist/ is missing: run npm run build');
  const durationS = ctx.quick ? 120 : 1200;
  ctx.progress(`combine: simulating two sessions of 2 × ${durationS} s`);
  const rev = sessionJournals(ctx, 'reversible-bar', durationS);
  const two = sessionJournals(ctx, 'two-length-carbide', durationS);
  const env = { ...process.env };
  delete env.HALFSWING_DEV;
  const commands: Record<string, string[]> = {
    node: ['-e', '0'],
    analyze: [BUNDLE, 'analyze', rev.files[0]!, '--json'],
    reversible: [BUNDLE, 'combine', ...rev.files, '--json'],
    twoLength: [BUNDLE, 'combine', ...two.files, '--json'],
  };
  const best: Record<string, ChildStats> = {};
  const rounds = ctx.quick ? 1 : 7;
  for (let r = 0; r < rounds; r++)
    for (const [name, args] of Object.entries(commands)) {
      const s = await runMeasured(process.execPath, args, { cwd: ctx.workDir, env });
      if (s.code !== 0) throw new Error(`${name} exited ${s.code}: ${s.stderr.trim().split('\n')[0] ?? ''}`);
      if (!best[name] || s.wallS < best[name].wallS) best[name] = s;
    }
  const base = best.analyze!.wallS;
  const row = (figure: string, name: string): Row => ({
    figure,
    value: best[name]!.wallS,
    unit: 's',
    baselineName: 'analyze --json of one of the journals',
    baseline: base,
    ratio: best[name]!.wallS / base,
    note: `best of ${rounds} interleaved rounds; node -e 0 ${best.node!.wallS.toFixed(3)} s; CPU ${best[name]!.cpuS?.toFixed(3) ?? '—'} s`,
  });
  return {
    id: 'combine',
    title: 'combine of two journals (bundle)',
    rows: [
      row(`halfswing combine --json, reversible bar, 2 × ${durationS / 60} min (${rev.lines} lines)`, 'reversible'),
      row(`halfswing combine --json, two lengths, 2 × ${durationS / 60} min (${two.lines} lines; reduced again at the fitted offset)`, 'twoLength'),
    ],
  };
}

export const combineBench: Benchmark = { id: 'combine', title: 'combine of two journals', run };
