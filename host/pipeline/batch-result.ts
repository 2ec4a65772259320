// The full result of a run so far: the clock chosen, the passes timed and sequenced, then the staged analysis.
import type { Rig } from '../../protocol/rig.ts';
import { analyzeRun } from '../analysis/analyze-run.ts';
import { STATUS_CODE } from '../analysis/passes.ts';
import { oneBeamPlaneRisk } from '../analysis/plane-warning.ts';
import type { Warning } from '../analysis/warning.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { ClockOption } from './clock-choice.ts';
import type { DeviceIntake } from './device-intake.ts';
import { sequencePasses, type PassSequence, type SequencingOptions } from './pass-sequencing.ts';

/** What the result needs besides the intake: the journal's header facts and the options that shape the analysis. */
export interface BatchInputs {
  readonly intake: DeviceIntake;
  readonly rig: Rig | null;
  readonly warnings: readonly Warning[];
  readonly startIso: string | null;
  readonly source: string | null;
  readonly lastHostUs: number | null;
  readonly clock: ClockOption;
  readonly sequencing: SequencingOptions | undefined;
  readonly delayDifferenceU_s: number | undefined;
  readonly rows: boolean;
}

/** Passes sequencing left out or split. */
function sequencingWarnings(seq: PassSequence): Warning[] {
  const w: Warning[] = [];
  if (seq.rejectedTransit > 0) w.push({ kind: 'passes-rejected-transit', count: seq.rejectedTransit });
  if (seq.rejectedTiming > 0) w.push({ kind: 'passes-rejected-timing', count: seq.rejectedTiming });
  if (seq.longGaps > 0) w.push({ kind: 'long-gaps', count: seq.longGaps, segments: seq.segments });
  return w;
}

/** Runs the analysis over everything the intake holds (does not change it). */
export function batchResult(b: BatchInputs): AnalysisResult {
  const { intake, rig } = b;
  const tb = intake.timebase;
  const w = [...b.warnings];
  if (intake.health.malformedLines > 0) w.push({ kind: 'malformed-journal-lines', count: intake.health.malformedLines });
  const rc = intake.clockInputs.choose(b.clock, tb.count, (x) => tb.hz(x), tb.hz(0), w);
  const joined = tb.joiner(rc.k, rc.offsets, rc.since);
  const cols = intake.beams.columns(0, joined, (x) => tb.hz(x) * rc.k, rig, rc.since);
  const { t, td, transit, plane } = cols;
  const np = t.length;
  const seq = sequencePasses(t, transit, cols.boot, b.sequencing);
  let unsequenced = 0;
  for (let i = 0; i < np; i++) if (seq.status[i] === STATUS_CODE.unsequenced) unsequenced++;
  w.push(...sequencingWarnings(seq));
  const risk = rig && !intake.beams.b && np > 1 ? oneBeamPlaneRisk(t[np - 1]! - t[0]!, rig.latitude_deg) : null;
  if (risk) w.push({ kind: 'one-beam-plane', ...risk });
  if (unsequenced > 0) w.push({ kind: 'passes-unsequenced', count: unsequenced });
  return analyzeRun({
    rig,
    passes: { t, td, transit, index: seq.index, segment: seq.segment, status: seq.status, bridgedBefore: seq.bridgedBefore },
    clock: rc.clock,
    counts: intake.health.counts(intake.beams.a?.counts ?? null, {
      rejected_passes: seq.rejectedTransit + seq.rejectedTiming,
      bridged_gaps: seq.bridgedGaps,
      unsequenced_passes: unsequenced,
      long_gaps: seq.longGaps,
    }),
    run: { start_iso: b.startIso, duration_s: (b.lastHostUs ?? 0) / 1e6, source: b.source, firmware: intake.hello?.fw ?? null, hz_nominal: tb.nominalHz() },
    warnings: w,
    quietBeforeFirstPass_s: intake.quietBeforeFirstPass_s ?? null,
    lineRejections: intake.health.lineRejections(),
    room: intake.roomOn(joined),
    plane,
    rows: b.rows,
    settings: intake.beams.settings(rig),
    ...(b.delayDifferenceU_s !== undefined ? { delayDifferenceU_s: b.delayDifferenceU_s } : {}),
  });
}
