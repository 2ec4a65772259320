// Child process of the ingest benchmark: reads a journal in one mode and prints {lines, wallS, maxRssMiB} as JSON
// (lines is counted in read mode only; the analyse mode must not pay for counting).
//   read     the journal split into lines, nothing done with them (the pure I/O baseline)
//   analyze  every entry pushed through the run pipeline, then the full result computed
import { createReadStream } from 'node:fs';
import { performance } from 'node:perf_hooks';
import { analyzeJournalFile } from '../../host/pipeline/analyze-entries.ts';

const [mode, file] = process.argv.slice(2);
if ((mode !== 'read' && mode !== 'analyze') || !file) {
  process.stderr.write('usage: ingest-child.ts read|analyze JOURNAL\n');
  process.exit(2);
}

const t0 = performance.now();
let lines = 0;
let summary: Record<string, unknown> = {};
if (mode === 'read') {
  // 64 KiB chunks split on LF into line strings: the cheapest way to read lines in Node, so the ratio is all work.
  let tail = '';
  for await (const chunk of createReadStream(file, { encoding: 'latin1', highWaterMark: 1 << 16 })) {
    const parts = (tail + (chunk as string)).split('\n');
    tail = parts.pop()!;
    lines += parts.length;
  }
  if (tail.length > 0) lines++;
} else {
  const { result } = await analyzeJournalFile(file);
  summary = { T0_s: result.T0_s, g_m_s2: result.g_m_s2, passes: result.passes, periods: result.periods };
}
const wallS = (performance.now() - t0) / 1000;
process.stdout.write(`${JSON.stringify({ mode, lines, wallS, maxRssMiB: process.resourceUsage().maxRSS / 1024, summary })}\n`);
