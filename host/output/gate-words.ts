// Words for the gate offset: a side only when the run shows it, else its size and how to find the side.
import type { GateSide } from '../analysis/warning.ts';
import { plusMinus } from './value-u.ts';

/** Below this (m), or within two standard uncertainties, the gate counts as centred: common practice, no source. */
const CENTRED_M = 0.0002;

/** What to do about the gate: "centred", a move toward or away from the release side, or the procedure that finds the side. */
export function gateAdvice(offset_m: number | null, u_m: number | null, side: GateSide): string {
  if (offset_m === null || !Number.isFinite(offset_m)) return 'not known yet';
  if (Math.abs(offset_m) <= Math.max(2 * (u_m ?? 0), CENTRED_M)) return 'centred';
  const mm = (Math.abs(offset_m) * 1000).toFixed(1);
  if (side === 'release') return `move it ${mm} mm ${offset_m > 0 ? 'away from' : 'toward'} the release side`;
  return 'side not known (the recording began mid-swing): move the gate 1 mm either way and re-run; the offset falls when the move was the right way';
}

/** The same advice in a few words, for a panel: a side only when known. */
export function gateNote(offset_m: number | null, u_m: number | null, side: GateSide): string {
  const a = gateAdvice(offset_m, u_m, side);
  return side === 'release' || a === 'centred' || a === 'not known yet' ? a.replace('move it ', 'move ') : 'side unknown: move 1 mm, re-run';
}

/** The offset as a figure: signed toward the release side when known, else its size alone (mm, value ± u). */
export function gateFigure(offset_m: number | null, u_m: number | null, side: GateSide): string {
  if (offset_m === null || !Number.isFinite(offset_m)) return '—';
  const u = u_m !== null ? u_m * 1000 : null;
  if (side === 'release') return `${plusMinus(offset_m * 1000, u, ' mm')} (+ toward the release side)`;
  return `${plusMinus(Math.abs(offset_m) * 1000, u, ' mm')} (side not known: the recording began mid-swing)`;
}
