// The recorder's status: one snapshot type, the stderr status line and the JSON for --status.
import { plusMinus } from '../output/value-u.ts';
import type { LiveState } from '../pipeline/live-state.ts';
import type { LinkStats } from '../link/device-link.ts';

/** A snapshot of a running (or finished) recording. SI units; null while unknown. */
export interface RecorderStatus {
  readonly updated_iso: string;
  readonly pid: number;
  readonly state: 'waiting-hello' | 'connected' | 'reconnecting' | 'stopped';
  readonly port: string | null;
  readonly journal: string;
  readonly journal_bytes: number;
  /** Host time of this snapshot, s since the block's #start. */
  readonly uptime_s: number;
  readonly lines: number;
  readonly lines_per_s: number;
  readonly passes: number;
  readonly period_s: number | null;
  readonly amplitude_deg: number | null;
  readonly g_m_s2: number | null;
  readonly g_u_m_s2: number | null;
  /** Lines rejected by the decoder or dropped by the framing. */
  readonly line_errors: number;
  /** Lines missing by sequence gaps. */
  readonly lines_lost: number;
  /** Edges the device says it dropped. */
  readonly device_lost: number;
  readonly reconnects: number;
  readonly reboots: number;
  readonly heartbeat_age_s: number | null;
  readonly warnings: readonly string[];
}

export interface StatusInputs {
  readonly wall: Date;
  readonly pid: number;
  readonly state: RecorderStatus['state'];
  readonly port: string | undefined;
  readonly journal: string;
  readonly journalBytes: number;
  readonly hostUs: number;
  readonly linesPerS: number;
  readonly link: LinkStats;
  readonly live: LiveState | undefined;
  readonly g: { readonly value: number | null; readonly u: number | null };
  readonly warnings: readonly string[];
}

/** Builds the snapshot from the link's counters and the pipeline's live state. */
export function buildStatus(i: StatusInputs): RecorderStatus {
  const c = i.live?.counts;
  return {
    updated_iso: i.wall.toISOString(),
    pid: i.pid,
    state: i.state,
    port: i.port ?? null,
    journal: i.journal,
    journal_bytes: i.journalBytes,
    uptime_s: Math.round(i.hostUs / 1000) / 1000,
    lines: i.link.lines,
    lines_per_s: Math.round(i.linesPerS * 10) / 10,
    passes: i.live?.passes ?? 0,
    period_s: i.live?.periodS ?? null,
    amplitude_deg: i.live?.amplitudeDeg ?? null,
    g_m_s2: i.g.value,
    g_u_m_s2: i.g.u,
    line_errors: i.link.lineErrors,
    lines_lost: c?.lines_lost ?? 0,
    device_lost: c?.device_lost ?? 0,
    reconnects: i.link.reconnects,
    reboots: c?.reboots ?? 0,
    heartbeat_age_s: i.live?.heartbeatAgeS ?? null,
    warnings: i.warnings,
  };
}

const fix = (v: number | null, d: number, unit = ''): string => (v === null ? '–' : `${v.toFixed(d)}${unit}`);

/** The one-line stderr status: passes, last period, amplitude, g so far, line errors, lost, reconnects. */
export function statusLine(s: RecorderStatus): string {
  const hms = s.updated_iso.slice(11, 19);
  // By the one rule of host/output/value-u.ts (u to two digits), as the summary and the live view show g.
  const g = s.g_m_s2 === null ? '–' : plusMinus(s.g_m_s2, s.g_u_m_s2, '', 5);
  const parts = [
    `${hms} ${s.state}`,
    `passes ${s.passes}`,
    `T ${fix(s.period_s, 5, ' s')}`,
    `amp ${fix(s.amplitude_deg, 2, '°')}`,
    `g ${g}`,
    `line errors ${s.line_errors}`,
    `lost ${s.lines_lost}+${s.device_lost}`,
    `reconnects ${s.reconnects}`,
  ];
  return `${parts.join('  ')}${s.warnings.length ? `  ! ${s.warnings.join('; ')}` : ''}`;
}
