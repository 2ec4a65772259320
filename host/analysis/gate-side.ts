// Whether the run shows which side the gate offset is on.
//
// The offset's sign comes out relative to the side the bob was on before the first pass. That is the release side
// only when the run recorded the release. A bob swinging through the beam crosses it every half-period, so a device
// that watched longer than a half-period before the first pass saw the bob at rest (or not reaching the beam): the
// first pass followed a release (or a push) from the side it was held on. Otherwise the recording joined mid-swing
// and the side is unknown. A second beam does not help: two beam lines through the rest point are unchanged by a
// half turn about the vertical, which maps a swing released from one side with the gate off by +x to one released
// from the other side with the gate off by −x, edge for edge (docs/two-beam-geometry.md: a direction and its
// opposite give the same transits and mid-crossings).
import type { SequencedPasses } from './passes.ts';
import type { GateSide } from './warning.ts';

/** Quiet must exceed the first half-period by this factor (host latency and the swing's own decay): common practice, no source. */
export const RELEASE_QUIET_FACTOR = 1.05;

/** 'release' when the quiet before the first pass proves the release was recorded, else null. */
export function gateSideOf(quietBeforeFirstPass_s: number | null | undefined, p: SequencedPasses): GateSide {
  if (quietBeforeFirstPass_s === null || quietBeforeFirstPass_s === undefined) return null;
  // The sign refers to the first valid pass: it must be the first pass of all (any pass before it flips the side).
  if (p.index.length < 2 || p.index[0] !== 0) return null;
  for (let c = 1; c < p.index.length; c++)
    if (p.index[c] === 1 && p.segment[c] === p.segment[0]) return quietBeforeFirstPass_s > RELEASE_QUIET_FACTOR * (p.td[c]! - p.td[0]!) ? 'release' : null;
  return null;
}
