// Time driven by hand for the link and the recorder: a clock and timers that move only when a test says so.
import type { Timers } from '../../../host/link/timers.ts';

interface Pending {
  readonly id: number;
  at: number;
  readonly fn: () => void;
  readonly everyMs?: number;
}

/** Lets pending I/O callbacks and promise chains run: event-loop turns, no wall-clock time. */
export async function settle(turns = 20): Promise<void> {
  for (let i = 0; i < turns; i++) await new Promise<void>((r) => setImmediate(r));
}

/** Waits (in event-loop turns, not a fixed sleep) until `pred` holds; throws naming `what` if it never does. */
export async function until(pred: () => boolean, what: string, turns = 20_000): Promise<void> {
  for (let i = 0; i < turns && !pred(); i++) await new Promise<void>((r) => setImmediate(r));
  if (!pred()) throw new Error(`timed out waiting for ${what}`);
}

/** A hand-moved clock (ms, read as integer µs by `nowUs`) with timers that fire only inside `advance`. */
export class ManualTime {
  nowMs = 0;
  private pending: Pending[] = [];
  private nextId = 1;

  readonly nowUs = (): number => Math.round(this.nowMs * 1000);

  readonly timers: Timers = {
    setTimeout: (fn, ms) => this.add(fn, ms),
    clearTimeout: (h) => this.remove(h),
    setInterval: (fn, ms) => this.add(fn, ms, Math.max(1, ms)),
    clearInterval: (h) => this.remove(h),
  };

  /** Timers not yet fired or cleared. */
  get count(): number {
    return this.pending.length;
  }

  /** Moves time forward by `ms`, firing each due timer at its own time, letting I/O settle after each. */
  async advance(ms: number): Promise<void> {
    const end = this.nowMs + ms;
    for (;;) {
      await settle();
      const next = this.pending.filter((p) => p.at <= end).sort((a, b) => a.at - b.at || a.id - b.id)[0];
      if (!next) break;
      this.nowMs = Math.max(this.nowMs, next.at);
      if (next.everyMs !== undefined) next.at += next.everyMs;
      else this.remove(next.id);
      next.fn();
    }
    this.nowMs = end;
    await settle();
  }

  /** Advances in `stepMs` steps until `pred` holds; throws after `maxMs` of simulated time. */
  async advanceUntil(pred: () => boolean, what: string, stepMs = 5, maxMs = 60_000): Promise<void> {
    for (let t = 0; t <= maxMs && !pred(); t += stepMs) await this.advance(stepMs);
    if (!pred()) throw new Error(`${what}: not within ${maxMs} ms of simulated time`);
  }

  private add(fn: () => void, ms: number, everyMs?: number): number {
    const id = this.nextId++;
    this.pending.push({ id, at: this.nowMs + Math.max(0, ms), fn, ...(everyMs !== undefined ? { everyMs } : {}) });
    return id;
  }

  private remove(h: unknown): void {
    this.pending = this.pending.filter((p) => p.id !== h);
  }
}
