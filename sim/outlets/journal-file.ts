// Writing a simulated journal and its truth file: whole at once (temp + rename), or paced in place for followers.
import { createWriteStream, existsSync, type WriteStream } from 'node:fs';
import { join } from 'node:path';
import { rename, rm, writeFile } from 'node:fs/promises';
import { once } from 'node:events';
import type { Scenario } from '../scenario.ts';
import { lineHostUs, paceLines, type PaceOptions } from '../pace.ts';
import { simulateJournal, type SimOptions } from '../simulate.ts';
import { truthJson, type Truth } from '../truth.ts';
import { sessionRuns, type SessionSpec, type SessionTruth } from '../session.ts';

/** The truth file written beside a journal. */
export function truthPathFor(journalPath: string): string {
  return `${journalPath}.truth.json`;
}

export interface JournalFileOptions extends SimOptions {
  readonly path: string;
  readonly signal?: AbortSignal;
  /**
   * N× real time: the journal grows in place as a recorder's would (so `halfswing watch` can follow it), and a
   * stop leaves the whole lines so far. Absent: as fast as possible, into a temporary file renamed at the end.
   */
  readonly speed?: number;
  readonly now?: PaceOptions['now'];
  readonly sleep?: PaceOptions['sleep'];
  /** The run's journal lines and truth (default: the device model's run, simulateJournal). */
  readonly source?: (scenario: Scenario, opts: SimOptions) => { lines: Iterable<string> | AsyncIterable<string>; truth: Truth };
}

async function put(out: WriteStream, text: string): Promise<void> {
  if (!out.write(text)) await once(out, 'drain');
}

async function writeTruth(path: string, truth: Truth): Promise<void> {
  const tmp = `${truthPathFor(path)}.tmp-${process.pid}`;
  await writeFile(tmp, `${truthJson(truth)}\n`);
  await rename(tmp, truthPathFor(path));
}

/**
 * Simulates a run into `path` and its truth into `path.truth.json`, with back-pressure so memory stays flat for
 * runs of days. Unpaced, nothing is left at either path unless both are complete. Paced, the truth is written
 * only when the run completes.
 */
export async function writeScenarioJournal(scenario: Scenario, opts: JournalFileOptions): Promise<{ truth: Truth; lines: number; rigTimeS: number }> {
  const { lines, truth } = (opts.source ?? simulateJournal)(scenario, opts);
  if (opts.speed !== undefined && Number.isFinite(opts.speed)) {
    const out = createWriteStream(opts.path, { encoding: 'latin1' });
    let n = 0;
    let lastUs = 0;
    try {
      for await (const line of paceLines(lines, { speed: opts.speed, signal: opts.signal, now: opts.now, sleep: opts.sleep })) {
        await put(out, `${line}\n`);
        lastUs = lineHostUs(line) ?? lastUs;
        n++;
      }
    } finally {
      out.end();
      await once(out, 'close');
    }
    if (truth.complete) await writeTruth(opts.path, truth);
    // A stop part-way leaves the rig time reached so far, not the planned duration.
    return { truth, lines: n, rigTimeS: truth.complete ? truth.duration_s : lastUs / 1e6 };
  }
  const tmp = `${opts.path}.tmp-${process.pid}`;
  const out = createWriteStream(tmp, { encoding: 'latin1' });
  let n = 0;
  try {
    let chunk = '';
    for await (const line of lines) {
      if (opts.signal?.aborted) throw new Error('aborted');
      chunk += `${line}\n`;
      n++;
      if (chunk.length >= 1 << 16) {
        await put(out, chunk);
        chunk = '';
      }
    }
    out.end(chunk);
    await once(out, 'finish');
    await writeTruth(opts.path, truth);
    await rename(tmp, opts.path);
    return { truth, lines: n, rigTimeS: truth.duration_s };
  } catch (e) {
    out.destroy();
    await rm(tmp, { force: true });
    await rm(`${truthPathFor(opts.path)}.tmp-${process.pid}`, { force: true });
    throw e;
  }
}

/**
 * Writes every run of a session as `dir/<run>.journal` (each with its truth file) and the session's truth as
 * `dir/<session>.session-truth.json`. Refuses, before writing anything, if any of those files exists.
 */
export async function writeSessionJournals(
  spec: SessionSpec,
  opts: {
    readonly seed: number;
    readonly dir: string;
    readonly durationS?: number;
    readonly signal?: AbortSignal;
    readonly onRun?: (path: string, i: number, n: number) => void;
    /** Journals state the rig as measured (sim/measured-rig.ts). */
    readonly measured_rig?: boolean;
  },
): Promise<{ paths: string[]; truthPath: string; truth: SessionTruth }> {
  const { runs, truth } = sessionRuns(spec, opts.seed, { measured_rig: opts.measured_rig });
  const paths = runs.map((r) => join(opts.dir, `${r.name}.journal`));
  const truthPath = join(opts.dir, `${spec.name}.session-truth.json`);
  const taken = [...paths.flatMap((p) => [p, truthPathFor(p)]), truthPath].find((p) => existsSync(p));
  if (taken) throw new SessionOutputError(`${taken} exists: choose another folder (nothing was written)`);
  for (let i = 0; i < runs.length; i++) {
    opts.onRun?.(paths[i]!, i, runs.length);
    await writeScenarioJournal(runs[i]!.scenario, { seed: runs[i]!.seed, durationS: opts.durationS, path: paths[i]!, signal: opts.signal });
  }
  const tmp = `${truthPath}.tmp-${process.pid}`;
  await writeFile(tmp, `${JSON.stringify({ ...truth, runs: truth.runs.map((r, i) => ({ ...r, file: paths[i] })) }, null, 1)}\n`);
  await rename(tmp, truthPath);
  return { paths, truthPath, truth };
}

/** A session that cannot be written where asked; the message is one line. */
export class SessionOutputError extends Error {}
