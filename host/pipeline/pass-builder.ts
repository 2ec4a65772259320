// Edges of the pendulum channel → blocked intervals → raw passes, with bounce merging, glitch rejection and resync.
//
// Order matters: an unblocked gap shorter than `bounceS` inside a transit is chatter of the detector, so the two
// blocked pieces merge first; only then is a blocked interval shorter than `glitchS` dropped as a glitch. A
// blocked interval is final once the next block starts later than the bounce gap (or time has moved on past it).
// Each transition is marked by its first edge: chatter right after the unblocking edge (a pulse, then the beam
// clear again within `chainS`) keeps the end at that first edge. Both transitions then shift alike with chatter,
// so the midpoint and the transit time stay unbiased.
// Two block-starts in a row (the end between them was lost) drop the open interval and restart at the later edge,
// so one lost line costs one pass, never the alignment of the passes after it.
import { F64Column, I32Column } from './growable.ts';

/** Passes as parallel columns: boot index, start and end ticks (unwrapped), host µs of the end edge's line. */
export class PassColumns {
  readonly boot = new I32Column();
  readonly start = new F64Column();
  readonly end = new F64Column();
  readonly hostUs = new F64Column();
  get length(): number {
    return this.boot.length;
  }
}

/** Counters of the edge-level cleaning. */
export interface EdgeCounts {
  glitches: number;
  bounces: number;
  resyncs: number;
}

interface Interval {
  boot: number;
  start: number;
  end: number;
  hostUs: number;
  /** The first unblocking edge of a chatter chain, while one is open. */
  firstEnd: number | null;
  /** The latest unblocking edge (the end itself unless chatter followed it). */
  lastEdge: number;
}

/** Builds passes from blocked/unblocked edges of one channel. */
export class PassBuilder {
  readonly passes = new PassColumns();
  readonly counts: EdgeCounts = { glitches: 0, bounces: 0, resyncs: 0 };
  private openStart: number | null = null;
  private openBoot = -1;
  private pending: Interval | null = null;
  private chainEnd: number | null = null;
  /** True while the beam is blocked (last edge seen was a block start). */
  blocked = false;

  constructor(
    /** Seconds → ticks of a boot. */
    private readonly ticksPerS: (boot: number) => number,
    private readonly glitchS: number,
    private readonly bounceS: number,
    /** Chatter ending within this time of the first unblocking edge keeps that edge as the end (s). */
    private readonly chainS: number,
  ) {}

  /** A block start at `ticks` of `boot`. */
  blockStart(boot: number, ticks: number): void {
    this.blocked = true;
    if (this.openStart !== null) {
      this.counts.resyncs++;
      this.openStart = ticks;
      this.openBoot = boot;
      this.chainEnd = null;
      return;
    }
    const p = this.pending;
    if (p && p.boot === boot && ticks - p.lastEdge < this.bounceS * this.ticksPerS(boot)) {
      this.counts.bounces++;
      this.openStart = p.start;
      this.openBoot = boot;
      // Chatter after a real transit's end keeps that end; chatter at a block start just extends the block.
      this.chainEnd = p.firstEnd ?? (p.end - p.start >= this.glitchS * this.ticksPerS(boot) ? p.end : null);
      this.pending = null;
      return;
    }
    this.flush();
    this.openStart = ticks;
    this.openBoot = boot;
    this.chainEnd = null;
  }

  /** A block end at `ticks` of `boot`, received at `hostUs`. */
  blockEnd(boot: number, ticks: number, hostUs: number): void {
    this.blocked = false;
    if (this.openStart === null || this.openBoot !== boot) {
      this.counts.resyncs++;
      this.openStart = null;
      return;
    }
    const first = this.chainEnd;
    const chatter = first !== null && ticks - first < this.chainS * this.ticksPerS(boot);
    this.pending = { boot, start: this.openStart, end: chatter ? first : ticks, hostUs, firstEnd: chatter ? first : null, lastEdge: ticks };
    this.openStart = null;
    this.chainEnd = null;
  }

  /** Lines were lost just before the next record: an open interval can no longer be trusted. */
  linesLost(): void {
    if (this.openStart !== null) this.counts.resyncs++;
    this.openStart = null;
  }

  /** Device time has reached `ticks` of `boot` (a heartbeat): a pending pass older than the bounce gap is final. */
  advance(boot: number, ticks: number): void {
    const p = this.pending;
    // The 50 ms margin allows for edges printed slightly after a heartbeat that preceded them.
    if (p && (p.boot !== boot || ticks - p.lastEdge > (this.bounceS + 0.05) * this.ticksPerS(boot))) this.flush();
  }

  /** A new boot: whatever was open belongs to the old timebase. */
  newBoot(): void {
    this.flush();
    this.openStart = null;
    this.blocked = false;
  }

  /** Makes the pending interval final (a pass, or a glitch). */
  flush(): void {
    const p = this.pending;
    if (!p) return;
    this.pending = null;
    if (p.end - p.start < this.glitchS * this.ticksPerS(p.boot)) {
      this.counts.glitches++;
      return;
    }
    this.passes.boot.push(p.boot);
    this.passes.start.push(p.start);
    this.passes.end.push(p.end);
    this.passes.hostUs.push(p.hostUs);
  }

  /** The pending interval if it would become a pass, without changing state (for a snapshot at end of data). */
  pendingPass(): Readonly<Omit<Interval, 'firstEnd' | 'lastEdge'>> | null {
    const p = this.pending;
    return p && p.end - p.start >= this.glitchS * this.ticksPerS(p.boot) ? p : null;
  }
}
