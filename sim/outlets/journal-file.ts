// Writing a simulated journal and its truth file: streamed to temporary files, renamed when complete.
import { createWriteStream } from 'node:fs';
import { rename, rm, writeFile } from 'node:fs/promises';
import { once } from 'node:events';
import type { Scenario } from '../scenario.ts';
import { simulateJournal, type SimOptions } from '../simulate.ts';
import { truthJson, type Truth } from '../truth.ts';

/** The truth file written beside a journal. */
export function truthPathFor(journalPath: string): string {
  return `${journalPath}.truth.json`;
}

/**
 * Simulates a run into `path` (and its truth into `path.truth.json`), writing with back-pressure so memory stays
 * flat for runs of days. Nothing is left at either path unless both are complete.
 */
export async function writeScenarioJournal(scenario: Scenario, opts: SimOptions & { path: string; signal?: AbortSignal }): Promise<{ truth: Truth; lines: number }> {
  const tmp = `${opts.path}.tmp-${process.pid}`;
  const truthTmp = `${truthPathFor(opts.path)}.tmp-${process.pid}`;
  const { lines, truth } = simulateJournal(scenario, opts);
  const out = createWriteStream(tmp, { encoding: 'latin1' });
  let n = 0;
  try {
    let chunk = '';
    for (const line of lines) {
      if (opts.signal?.aborted) throw new Error('aborted');
      chunk += `${line}\n`;
      n++;
      if (chunk.length >= 1 << 16) {
        if (!out.write(chunk)) await once(out, 'drain');
        chunk = '';
      }
    }
    out.end(chunk);
    await once(out, 'finish');
    await writeFile(truthTmp, `${truthJson(truth)}\n`);
    await rename(truthTmp, truthPathFor(opts.path));
    await rename(tmp, opts.path);
    return { truth, lines: n };
  } catch (e) {
    out.destroy();
    await rm(tmp, { force: true });
    await rm(truthTmp, { force: true });
    throw e;
  }
}
