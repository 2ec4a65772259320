// A scenario run with the shipped firmware as its device: the same physics, gate and link as the model's
// run, the firmware's own UART lines in between. Streams, so runs of days keep memory flat.
import { journalAnnotation, journalData } from '../../protocol/journal.ts';
import { LinkModel, type SimEntry } from '../link.ts';
import type { Scenario } from '../scenario.ts';
import { linkOptions, type SimOptions } from '../simulate.ts';
import type { Truth } from '../truth.ts';
import { FirmwareDevice, prepareFirmwareRun } from './firmware-device.ts';

/** Host seconds emulated per request to the harness: long enough to amortise the round trip. */
const CHUNK_S = 2;

export interface FirmwareRunOptions extends SimOptions {
  /** Called after each chunk with the host time reached and the run's end (for a status line). */
  readonly onProgress?: (t: number, tEnd: number) => void;
  readonly signal?: AbortSignal;
}

/**
 * The run as journal entries. Faults of the gate (bounce, objects) reach the firmware through its input and
 * the link's (lost and corrupted lines, unplugs) apply to its lines; the model's device faults (reboots,
 * stalls, drop windows) have no counterpart here. Throws EmulatorUnavailable before anything is produced
 * when the toolchain is missing.
 */
export function firmwareEntries(base: Scenario, opts: FirmwareRunOptions): { header: string[]; entries: AsyncIterable<SimEntry>; truth: Truth } {
  const run = prepareFirmwareRun(base, opts);
  const { truth, scenario } = run;
  async function* gen(): AsyncGenerator<SimEntry> {
    const device = new FirmwareDevice(run);
    const link = new LinkModel(linkOptions(run));
    const tEnd = scenario.duration_s;
    try {
      yield* link.open();
      let over = false;
      for (let t = 0; !over && t < tEnd && !opts.signal?.aborted; ) {
        t = Math.min(t + CHUNK_S, tEnd);
        for (const l of await device.advance(t)) {
          const entries = link.line(l);
          if (!entries) {
            over = true;
            break;
          }
          yield* entries;
        }
        opts.onProgress?.(t, tEnd);
      }
      if (opts.signal?.aborted) return;
      yield* link.close();
      truth.complete = true;
    } finally {
      await device.close();
    }
  }
  return { header: run.header, entries: gen(), truth };
}

/** The run as journal text lines (no LF), header first; see firmwareEntries. */
export function firmwareJournal(base: Scenario, opts: FirmwareRunOptions): { lines: AsyncIterable<string>; truth: Truth } {
  const { header, entries, truth } = firmwareEntries(base, opts);
  async function* gen(): AsyncGenerator<string> {
    yield* header;
    for await (const e of entries) yield e.kind === 'data' ? journalData(e.hostUs, e.line) : journalAnnotation(e.hostUs, e.word, e.text);
  }
  return { lines: gen(), truth };
}
