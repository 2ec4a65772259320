// `npm run bench [-- --only ID[,ID…]] [--json] [--quick] [--out FILE]`: runs the benchmarks, prints the table, writes results.json.
import { mkdtempSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { performance } from 'node:perf_hooks';
import { NotMeasured, REPO_ROOT, type BenchContext, type Benchmark } from './benchmark.ts';
import { describeMachine, machineLine } from './machine.ts';
import { renderNotes, renderTable, type FigureResult } from './report.ts';
import { BENCHMARKS } from './benchmarks.ts';

const { values } = parseArgs({
  options: {
    only: { type: 'string' },
    json: { type: 'boolean', default: false },
    quick: { type: 'boolean', default: false },
    out: { type: 'string' },
    help: { type: 'boolean', short: 'h', default: false },
  },
  strict: true,
});

if (values.help) {
  process.stdout.write(
    `npm run bench -- [--only ID[,ID...]] [--json] [--quick] [--out FILE]\n\nBenchmarks: ${BENCHMARKS.map((b) => `${b.id} (${b.title})`).join(', ')}\n` +
      `--json prints the results as one JSON object; --quick uses tiny sizes (smoke runs; the numbers mean nothing).\n` +
      `Results are also written to test/bench/results.json (or FILE).\n`,
  );
  process.exit(0);
}

const wanted = values.only?.split(',').map((s) => s.trim()).filter(Boolean);
const unknown = wanted?.filter((id) => !BENCHMARKS.some((b) => b.id === id)) ?? [];
if (unknown.length > 0) {
  process.stderr.write(`unknown benchmark ${unknown.join(', ')}; choose from ${BENCHMARKS.map((b) => b.id).join(', ')}\n`);
  process.exit(2);
}
const selected: Benchmark[] = wanted ? BENCHMARKS.filter((b) => wanted.includes(b.id)) : [...BENCHMARKS];

const workDir = mkdtempSync(join(tmpdir(), 'halfswing-bench-'));
const machine = describeMachine();
const results: FigureResult[] = [];
try {
  for (const b of selected) {
    const ctx: BenchContext = { quick: values.quick ?? false, workDir, progress: (msg) => process.stderr.write(`[${b.id}] ${msg}\n`) };
    ctx.progress(`start: ${b.title}`);
    const t0 = performance.now();
    let r: FigureResult;
    try {
      r = await b.run(ctx);
    } catch (e) {
      if (!(e instanceof NotMeasured)) throw e;
      r = { id: b.id, title: b.title, rows: [], notMeasured: e.message };
    }
    const wallS = (performance.now() - t0) / 1000;
    results.push({ ...r, wallS });
    ctx.progress(`done in ${wallS.toFixed(1)} s${r.notMeasured ? ` (not measured: ${r.notMeasured})` : ''}`);
  }
} finally {
  rmSync(workDir, { recursive: true, force: true });
}

const doc = { when: new Date().toISOString(), machine, quick: values.quick ?? false, results };
const outFile = values.out ?? join(REPO_ROOT, 'test', 'bench', 'results.json');
writeFileSync(`${outFile}.tmp`, `${JSON.stringify(doc, null, 2)}\n`);
renameSync(`${outFile}.tmp`, outFile);

if (values.json) {
  process.stdout.write(`${JSON.stringify(doc)}\n`);
} else {
  const notes = renderNotes(results);
  process.stdout.write(`\nMachine: ${machineLine(machine)}\n\n${renderTable(results)}\n${notes ? `\n${notes}\n` : ''}\nWritten to ${outFile}\n`);
}
