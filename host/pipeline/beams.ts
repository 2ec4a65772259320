// The rig's beams: edges routed to one pass builder per beam (or to the PPS input), and the passes as columns.
//
// The pass time is the middle of the blocked interval: the swing is time-symmetric about the lowest point, so for a
// centred beam the midpoint is the crossing time exactly; sensor delays shift every midpoint alike and cancel in
// intervals (DEVELOPERS.md).
import type { EdgeRecord } from '../../protocol/records.ts';
import type { Rig } from '../../protocol/rig.ts';
import type { Blocked } from '../analysis/plane-passes.ts';
import { runPlane, type RunPlane } from '../analysis/plane-of-run.ts';
import { PassBuilder } from './pass-builder.ts';

const G_N = 9.80665;

/**
 * Transit time of a 90° swing, w/v at the bottom with v = 2√(gL)·sin 45°: shorter than any transit of a real
 * swing, so a fraction of it separates detector chatter and glitches from transits. Without a rig: 5 ms.
 */
function shortestTransitS(rig: Rig | null): number {
  if (!rig) return 5e-3;
  return rig.flag_width_m / (2 * Math.sqrt(G_N * rig.length_m) * Math.SQRT1_2);
}

/** Glitch/bounce default: 10 % of the shortest plausible transit (see shortestTransitS), within 20 µs–2 ms. */
function defaultEdgeThresholdS(rig: Rig | null): number {
  return Math.min(2e-3, Math.max(2e-5, 0.1 * shortestTransitS(rig)));
}

/** Passes of beam A from `from` on (the pending one included), on one timebase; with two beams, their plane. */
export interface PassColumnsS {
  /** Pass time on the host-joined timebase (s). */
  readonly t: Float64Array;
  /** Pass time since its boot's tick 0 (s). */
  readonly td: Float64Array;
  /** Transit (s); with two beams, the transit a square crossing would have had where the plane gives one. */
  readonly transit: Float64Array;
  readonly boot: Int32Array;
  readonly plane: RunPlane | null;
}

/** Edge thresholds of the builders; both default to 10 % of the transit of a 90° swing, 20 µs–2 ms. */
export interface EdgeThresholds {
  /** Blocked intervals shorter than this are glitches (s). */
  readonly glitchS?: number;
  /** Unblocked gaps shorter than this inside a transit are bounce (s). */
  readonly bounceS?: number;
}

/** One pass builder per beam of the rig, created at the first device line with the rig known then. */
export class Beams {
  a: PassBuilder | null = null;
  /** The second beam's passes, when the rig has two (docs/two-beam-geometry.md). */
  b: PassBuilder | null = null;
  private glitchS = 0;
  private bounceS = 0;

  constructor(
    private readonly given: EdgeThresholds,
    private readonly ticksPerS: (boot: number) => number,
  ) {}

  /** The builders, created on first use. */
  ensure(rig: Rig | null): PassBuilder {
    if (!this.a) {
      this.glitchS = this.given.glitchS ?? defaultEdgeThresholdS(rig);
      this.bounceS = this.given.bounceS ?? defaultEdgeThresholdS(rig);
      const make = (): PassBuilder => new PassBuilder(this.ticksPerS, this.glitchS, this.bounceS, 4 * this.bounceS);
      this.a = make();
      if (rig?.beams.length === 2) this.b = make();
    }
    return this.a;
  }

  /** Both builders, for the events that reach every beam (a new boot, lost lines, a heartbeat). */
  each(f: (p: PassBuilder) => void): void {
    if (this.a) f(this.a);
    if (this.b) f(this.b);
  }

  /** An edge of a beam's channel goes to its builder; returns false for an edge of another channel. */
  edge(rig: Rig | null, rec: EdgeRecord, boot: number, ticks: number, hostUs: number): boolean {
    const p = rec.ch === (rig ? rig.beams[0].channel : 0) ? this.ensure(rig) : this.b && rec.ch === rig!.beams[1]?.channel ? this.b : null;
    if (!p) return false;
    const blocks = (rig?.blocked_level ?? 'low') === 'low' ? rec.edge === 'f' : rec.edge === 'r';
    if (blocks) p.blockStart(boot, ticks);
    else p.blockEnd(boot, ticks, hostUs);
    return true;
  }

  /** The thresholds in use (the defaults for `rig` before any device line). */
  settings(rig: Rig | null): { glitch_s: number; bounce_s: number } {
    return { glitch_s: this.glitchS || (this.given.glitchS ?? defaultEdgeThresholdS(rig)), bounce_s: this.bounceS || (this.given.bounceS ?? defaultEdgeThresholdS(rig)) };
  }

  /** Beam A's passes before the pending one, plus that one if it would become a pass. */
  count(): number {
    return (this.a?.passes.length ?? 0) + (this.a?.pendingPass() ? 1 : 0);
  }

  /** Changes whenever a pass of either beam is added or the pending one changes (a cache key). */
  version(): string {
    const v = (p: PassBuilder | null): string => {
      const q = p?.pendingPass();
      return `${p?.passes.length ?? 0}/${q ? `${q.start}-${q.end}` : ''}`;
    };
    return `${v(this.a)}:${v(this.b)}`;
  }

  /**
   * Beam A's passes from `from` on, timed by `joined` (ticks of a boot → s) at `tps` ticks per second per boot, or
   * by `since` (seconds since the boot's tick 0) when the clock's rate was tracked through the run.
   */
  columns(from: number, joined: (b: number, ticks: number) => number, tps: (b: number) => number, rig: Rig | null, since: ((b: number, ticks: number) => number) | null = null): PassColumnsS {
    const pb = this.a;
    const pend = pb?.pendingPass() ?? null;
    const total = this.count();
    const n = Math.max(0, total - from);
    const t = new Float64Array(n);
    const td = new Float64Array(n);
    const transit = new Float64Array(n);
    const boot = new Int32Array(n);
    const blockedA: Blocked[] = [];
    for (let i = 0; i < n; i++) {
      const q = from + i;
      const fromPending = q === total - 1 && pend !== null;
      const b = fromPending ? pend.boot : pb!.passes.boot.at(q);
      const s = fromPending ? pend.start : pb!.passes.start.at(q);
      const e = fromPending ? pend.end : pb!.passes.end.at(q);
      td[i] = since ? since(b, 0.5 * (s + e)) : (0.5 * (s + e)) / tps(b);
      t[i] = joined(b, 0) + td[i]!;
      transit[i] = (e - s) / tps(b);
      boot[i] = b;
      if (this.b) blockedA.push({ start: joined(b, s), end: joined(b, e) });
    }
    const plane = rig && this.b ? runPlane(rig, blockedA, blockedSince(this.b, joined, from > 0 && n > 0 ? blockedA[0]!.start - SECOND_BEAM_MARGIN_S : -Infinity)) : null;
    // Two beams: amplitude, damping and Q run on the transit a square crossing would have had.
    if (plane) for (let i = 0; i < n; i++) if (Number.isFinite(plane.squareTransit[i]!)) transit[i] = plane.squareTransit[i]!;
    return { t, td, transit, boot, plane };
  }
}

/** A window of beam A's passes pairs with beam B's from this long before its first pass (s): longer than any half-period. */
const SECOND_BEAM_MARGIN_S = 60;

/** A builder's closed intervals that end at or after `fromS` on the host-joined timebase. */
function blockedSince(p: PassBuilder, joined: (boot: number, ticks: number) => number, fromS: number): Blocked[] {
  const out: Blocked[] = [];
  for (let i = p.passes.length - 1; i >= 0; i--) {
    const end = joined(p.passes.boot.at(i), p.passes.end.at(i));
    if (end < fromS) break;
    out.push({ start: joined(p.passes.boot.at(i), p.passes.start.at(i)), end });
  }
  return out.reverse();
}
