// Simulated journals for the benchmarks, cached between runs under the OS temp folder.
//
// A 7-day journal takes the simulator longer than a benchmark may run, so files are kept, keyed by a hash of
// the scenario and of every simulator source file: any change to the simulator makes a fresh file.
import { createHash } from 'node:crypto';
import { createWriteStream, existsSync, mkdirSync, readdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { once } from 'node:events';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { REPO_ROOT, type BenchContext } from './benchmark.ts';

export interface WrittenJournal {
  readonly file: string;
  readonly lines: number;
  readonly bytes: number;
}

/** Scenario for the ingest figure: a 1 m (≈ 2 s) pendulum that keeps swinging for a week. */
export const LONG_RUN_SCENARIO = join(REPO_ROOT, 'test', 'bench', 'scenarios', 'bench-day.json');

const CACHE_DIR = join(tmpdir(), 'halfswing-bench-cache');

function simSourceHash(): string {
  const h = createHash('sha256');
  const walk = (dir: string): void => {
    for (const name of readdirSync(dir).sort()) {
      const p = join(dir, name);
      if (statSync(p).isDirectory()) {
        if (name !== 'build' && name !== 'emulator') walk(p);
      } else if (name.endsWith('.ts') || name.endsWith('.json')) {
        h.update(name).update(readFileSync(p));
      }
    }
  };
  walk(join(REPO_ROOT, 'sim'));
  return h.digest('hex');
}

/** Returns a journal of `durationS` of a scenario, simulating it only when no cached copy matches. */
export async function simulatedJournal(ctx: BenchContext, scenarioFile: string, durationS: number, seed = 1): Promise<WrittenJournal> {
  const key = createHash('sha256').update(simSourceHash()).update(readFileSync(scenarioFile)).update(`${durationS} ${seed}`).digest('hex').slice(0, 16);
  mkdirSync(CACHE_DIR, { recursive: true });
  const file = join(CACHE_DIR, `${key}.journal`);
  const meta = `${file}.json`;
  if (existsSync(file) && existsSync(meta)) return JSON.parse(readFileSync(meta, 'utf8')) as WrittenJournal;
  ctx.progress(`simulating ${durationS} s into ${file} (cached for later runs)`);
  const { lines } = simulateJournal(loadScenario(scenarioFile), { seed, durationS });
  const tmp = `${file}.${process.pid}.tmp`;
  const out = createWriteStream(tmp, { encoding: 'latin1' });
  let n = 0;
  let bytes = 0;
  let chunk: string[] = [];
  let nextReport = Date.now() + 5000;
  const flush = async (): Promise<void> => {
    const text = `${chunk.join('\n')}\n`;
    chunk = [];
    bytes += text.length;
    if (!out.write(text)) await once(out, 'drain');
  };
  for (const line of lines) {
    chunk.push(line);
    n++;
    if (chunk.length >= 4096) {
      await flush();
      if (Date.now() > nextReport) {
        ctx.progress(`simulating: ${n} lines so far`);
        nextReport = Date.now() + 5000;
      }
    }
  }
  if (chunk.length > 0) await flush();
  out.end();
  await once(out, 'finish');
  renameSync(tmp, file);
  const written: WrittenJournal = { file, lines: n, bytes };
  const metaTmp = `${meta}.${process.pid}.tmp`;
  writeFileSync(metaTmp, JSON.stringify(written));
  renameSync(metaTmp, meta);
  return written;
}
