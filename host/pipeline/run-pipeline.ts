// The one pipeline: journal entries → decoded records → edges → passes → analysis, identical live and in batch.
//
// `push` is cheap and incremental (decoding, sequence tracking, edge cleaning into compact pass columns);
// `result` runs the full analysis over everything pushed so far without changing the state, so calling it (or
// `live`) at any moment never changes later numbers. `live` runs the same stages on the newest passes with the
// clock `result` would choose at that moment (host/pipeline/live-estimator.ts says where the two may differ).
import type { Warning } from '../analysis/warning.ts';
import { connectBaud, type JournalEntry } from '../../protocol/journal.ts';
import { parseRig, swingView, type AnyRig, type Rig } from '../../protocol/rig.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import { batchResult } from './batch-result.ts';
import type { EdgeThresholds } from './beams.ts';
import type { ClockOption } from './clock-choice.ts';
import { DeviceIntake } from './device-intake.ts';
import type { LiveState } from './live-state.ts';
import { liveSnapshots } from './live-snapshot.ts';
import type { SequencingOptions } from './pass-sequencing.ts';

/** Options of a pipeline. */
export interface PipelineOptions extends EdgeThresholds {
  /** The rig; without it the journal's `#rig` line is used. */
  readonly rig?: Rig;
  /** Clock correction: `host`, `pps`, `nominal` or a rate error in ppm; default auto (PPS if present, else host if long enough). */
  readonly clock?: ClockOption;
  /** Channel of a 1 PPS reference (default 1, ignored when it is one of the rig's beams). */
  readonly ppsChannel?: number;
  /** Tunables of the pass sequencing (host/pipeline/pass-sequencing.ts). */
  readonly sequencing?: SequencingOptions;
  /** Standard uncertainty of the sensor's on/off delay difference, s (default 5 µs). */
  readonly delayDifferenceU_s?: number;
}

/** The pipeline object. */
export interface RunPipeline {
  /** Feeds one journal entry. */
  push(entry: JournalEntry): void;
  /**
   * The live snapshot (cached between passes); `nowHostUs` (µs since `#start`) sets the heartbeat age. `delayS`: the
   * gate delay difference of the caller's latest full result (s); default that of this pipeline's latest `result`,
   * or the prior 0 before one.
   */
  live(nowHostUs?: number, delayS?: number): LiveState;
  /**
   * The full analysis of everything pushed so far (deterministic; does not change the pipeline).
   * `rows: false` leaves `swings` empty (faster, for a summary or JSON that does not print them).
   */
  result(opts?: { rows?: boolean }): AnalysisResult;
  /** The rig in use (given, or from the journal), if any; a reversible pendulum's as its swingView. */
  rig(): Rig | null;
  /** The journal's own #rig as its file gives it (a reversible pendulum included), if it had a usable one. */
  journalRig(): AnyRig | null;
}

/** Creates a pipeline. */
export function createRunPipeline(opts: PipelineOptions = {}): RunPipeline {
  const warnings: Warning[] = [];
  const head = { startIso: null as string | null, source: null as string | null, lastHostUs: null as number | null };
  let journalRig: { view: Rig; file: AnyRig } | null = null;
  const rigNow = (): Rig | null => opts.rig ?? journalRig?.view ?? null;
  const givenPpm = typeof opts.clock === 'number' ? opts.clock : 0;
  const intake = new DeviceIntake({ glitchS: opts.glitchS, bounceS: opts.bounceS, ppsChannel: opts.ppsChannel ?? 1, givenPpm }, rigNow, warnings);
  const live = liveSnapshots(intake, rigNow, opts.clock, opts.sequencing);
  // The delay the latest full result calibrated: the live window spans too little amplitude to fit it.
  let lastDelayS = 0;

  const rigLine = (json: string): void => {
    if (opts.rig || journalRig) return;
    const r = parseRig(json);
    if (r.ok) journalRig = { view: swingView(r.rig), file: r.rig };
    else warnings.push({ kind: 'rig-line-unusable', detail: r.error });
  };

  return {
    push(entry: JournalEntry): void {
      switch (entry.kind) {
        case 'data':
          head.lastHostUs = entry.hostUs;
          return intake.data(entry.hostUs, entry.line);
        case 'annotation':
          head.lastHostUs = entry.hostUs;
          if (entry.word === 'disconnect') intake.health.disconnect();
          else if (entry.word === 'connect') intake.link.connect(connectBaud(entry.text));
          return;
        case 'start':
          head.startIso ??= entry.iso;
          return;
        case 'source':
          head.source ??= entry.text;
          return;
        case 'rig':
          return rigLine(entry.json);
        case 'malformed':
          return intake.health.malformed();
        default:
          return;
      }
    },
    live: (nowHostUs, delayS) => live.snapshot(head.lastHostUs, nowHostUs ?? null, delayS ?? lastDelayS),
    result: (ro = {}) => {
      const r = batchResult({
        intake,
        rig: rigNow(),
        warnings,
        ...head,
        clock: opts.clock,
        sequencing: opts.sequencing,
        delayDifferenceU_s: opts.delayDifferenceU_s,
        rows: ro.rows ?? true,
      });
      lastDelayS = r.gate_delay?.difference_s ?? 0;
      return r;
    },
    rig: rigNow,
    journalRig: () => journalRig?.file ?? null,
  };
}
