// Loads the recorded store snapshots (fixtures/record-snapshots.ts) and fakes a store and a feed around them.
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { LiveStore, StoreSnapshot } from '../../host/tui/live-store.ts';
import type { FeedStatus } from '../../host/tui/feed.ts';

export interface Recorded {
  readonly scenario: string;
  readonly seed: number;
  readonly untilS: number;
  readonly truth: { readonly T0_s: number; readonly g_m_s2: number; readonly gate_offset_m: number };
  readonly snapshot: StoreSnapshot;
}

const here = dirname(fileURLToPath(import.meta.url));

export function loadRecorded(name: 'snapshot-demo-120s' | 'snapshot-night-reboot' | 'snapshot-plane-room'): Recorded {
  return JSON.parse(readFileSync(join(here, 'fixtures', `${name}.json`), 'utf8')) as Recorded;
}

/** A store that always shows one snapshot and records restarts. */
export function fixedStore(snapshot: StoreSnapshot): LiveStore & { restarts: number } {
  const s = {
    restarts: 0,
    push() {},
    subscribe: () => () => {},
    getSnapshot: () => snapshot,
    restart() {
      s.restarts++;
    },
    flush: async () => {},
    stop() {},
  };
  return s;
}

export function demoStatus(over: Partial<FeedStatus> = {}): FeedStatus {
  return { sourceKind: 'demo', sourceLabel: 'demo-low-q', speed: 5, connection: { kind: 'simulated' }, journal: null, writesJournal: false, ...over };
}

/** A macrotask: ink attaches its input listener in an effect, and renders after a timer (observed while writing these tests). */
export const tick = (ms = 20): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** Waits until the last frame satisfies `pred` (a few hundred ms at most), then returns it. */
export async function frameWhere(last: () => string | undefined, pred: (f: string) => boolean, tries = 50): Promise<string> {
  for (let i = 0; i < tries; i++) {
    const f = last();
    if (f !== undefined && pred(f)) return f;
    await tick(10);
  }
  return last() ?? '';
}
