// Facts about the journal a report is tied to, given by the caller (the analyze command).
import type { AnyRig, Rig } from '../../protocol/rig.ts';

/** Facts about the journal the report is tied to. */
export interface ReportMeta {
  readonly journalName: string;
  readonly journalSha256: string;
  readonly rig: Rig | null;
  /** The rig as its file gives it, when that is not `rig` itself (a reversible pendulum: `rig` is its timing view). */
  readonly fileRig?: AnyRig | null;
  /** The CSV path relative to the report's folder (/ separators), or null without --csv. */
  readonly csvName: string | null;
}
