// Simulated journals for the benchmarks: written once per run through the simulator's streaming output.
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { importPart, type BenchContext } from './benchmark.ts';

/** The parts of sim/index.ts the benchmarks use. */
export interface SimApi {
  loadScenario(nameOrFile: string): unknown;
  simulateJournal(scenario: unknown, opts: Record<string, unknown>): { lines: Iterable<string> | AsyncIterable<string>; truth: unknown };
}

export async function loadSim(): Promise<SimApi> {
  return importPart<SimApi>('sim/index.ts', ['loadScenario', 'simulateJournal']);
}

export interface WrittenJournal {
  readonly file: string;
  readonly lines: number;
  readonly bytes: number;
  /** Wall time to simulate and write it. */
  readonly wallS: number;
  readonly simulatedS: number;
  readonly truth: unknown;
}

/** Scenario for the ingest and simulator figures: a 1 m (≈ 2 s) pendulum. */
export const LONG_RUN_SCENARIO = 'bench-day';

const cache = new Map<string, Promise<WrittenJournal>>();

/** Simulates `durationS` of a scenario into a journal file in the run's scratch folder (memoised per run). */
export function simulatedJournal(ctx: BenchContext, scenarioName: string, durationS: number, seed = 1): Promise<WrittenJournal> {
  const key = `${scenarioName}-${durationS}-${seed}`;
  let p = cache.get(key);
  if (!p) {
    p = writeJournal(ctx, scenarioName, durationS, seed, join(ctx.workDir, `${key}.journal`));
    cache.set(key, p);
  }
  return p;
}

async function writeJournal(ctx: BenchContext, scenarioName: string, durationS: number, seed: number, file: string): Promise<WrittenJournal> {
  const sim = await loadSim();
  const scenario = sim.loadScenario(scenarioName);
  const t0 = performance.now();
  const { lines, truth } = sim.simulateJournal(scenario, { seed, durationS });
  const out = createWriteStream(file, { encoding: 'latin1' });
  let n = 0;
  let bytes = 0;
  let chunk: string[] = [];
  let nextReport = t0 + 5000;
  const flush = async (): Promise<void> => {
    const text = `${chunk.join('\n')}\n`;
    chunk = [];
    bytes += text.length;
    if (!out.write(text)) await once(out, 'drain');
  };
  for await (const line of lines) {
    chunk.push(line);
    n++;
    if (chunk.length >= 4096) {
      await flush();
      const now = performance.now();
      if (now > nextReport) {
        ctx.progress(`simulating ${scenarioName} ${durationS} s: ${n} lines so far`);
        nextReport = now + 5000;
      }
    }
  }
  if (chunk.length > 0) await flush();
  out.end();
  await once(out, 'finish');
  return { file, lines: n, bytes, wallS: (performance.now() - t0) / 1000, simulatedS: durationS, truth };
}
