// Facts about the journal a report is tied to, given by the caller (the analyze command).
import type { Rig } from '../../protocol/rig.ts';

/** Facts about the journal the report is tied to. */
export interface ReportMeta {
  readonly journalName: string;
  readonly journalSha256: string;
  readonly rig: Rig | null;
  /** The CSV path relative to the report's folder (/ separators), or null without --csv. */
  readonly csvName: string | null;
}
