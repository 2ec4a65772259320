// Stage: one row per pass for the per-swing table (CSV), with flags that say how the pass was used.
import { passStatus, type PassStatus, type SequencedPasses } from '../passes.ts';
import type { RunPlane } from '../plane-of-run.ts';
import type { RoomColumns } from '../room-at-pass.ts';
import type { SwingRow } from '../result.ts';
import type { Periods } from './periods.ts';
import type { Reduction } from './reduction.ts';

const DEG = 180 / Math.PI;
const NO_FLAGS: string[] = [];
/** The flag a status puts on its row (none for a valid pass). */
const STATUS_FLAG: { readonly [K in PassStatus]: string | null } = {
  valid: null,
  'rejected-transit': 'rejected:transit',
  'rejected-timing': 'rejected:timing',
  unsequenced: 'unsequenced',
};

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

function flagsOf(p: SequencedPasses, per: Periods, c: number): readonly string[] {
  const status = passStatus(p.status, c);
  if (status === 'valid' && p.bridgedBefore[c] === 0 && p.index[c] !== 0 && !per.slow[c]) return NO_FLAGS;
  const flags: string[] = [];
  const sf = STATUS_FLAG[status];
  if (sf) flags.push(sf);
  if (p.bridgedBefore[c]! > 0) flags.push(`bridged:${p.bridgedBefore[c]}`);
  if (per.slow[c]) flags.push('slow-transit');
  if (p.index[c] === 0) flags.push(`segment-start:${p.segment[c]}`);
  return flags;
}

/** The rows stage; `withRig` says whether reduced periods exist; a two-beam run adds the plane's columns, room readings the room's. */
export function swingRows(p: SequencedPasses, per: Periods, red: Reduction, withRig: boolean, plane?: RunPlane | null, room?: RoomColumns | null): SwingRow[] {
  const n = p.t.length;
  const pk = new Int32Array(n).fill(-1);
  per.ends.forEach((c, k) => (pk[c] = k));
  const rows: SwingRow[] = [];
  for (let c = 0; c < n; c++) {
    const k = pk[c]!;
    rows.push({
      index: c,
      t_s: p.t[c]!,
      transit_s: p.transit[c]!,
      half_period_s: finiteOrNull(per.half[c]!),
      period_s: finiteOrNull(per.period[c]!),
      amplitude_deg: finiteOrNull(red.amp[c]! * DEG),
      period0_s: k >= 0 && withRig ? finiteOrNull(red.P0[k]!) : null,
      flags: flagsOf(p, per, c),
      ...(plane ? { azimuth_deg: finiteOrNull(plane.azimuthDeg[c]!), minor_axis_m: finiteOrNull(plane.minorM[c]!) } : {}),
      ...(room ? { temperature_C: finiteOrNull(room.tempC[c]!), pressure_Pa: finiteOrNull(room.pressPa[c]!), humidity_pct: finiteOrNull(room.rhPct[c]!) } : {}),
    });
  }
  return rows;
}
