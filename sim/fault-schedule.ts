// The timed faults of a run, drawn once from the seed: reboots, stalls, drop windows, disconnects, objects.
import type { EventFault, Faults, Range } from './scenario.ts';
import { Rng } from './prng.ts';

/** A fault window [start, end) in true (host) seconds. */
export interface Window {
  readonly start: number;
  readonly end: number;
}

export interface FaultSchedule {
  readonly reboots: readonly { readonly t: number; readonly cause: string }[];
  readonly stalls: readonly Window[];
  readonly drops: readonly Window[];
  readonly disconnects: readonly Window[];
  readonly objects: readonly Window[];
}

function arrivals(f: EventFault | undefined, rng: Rng, tEnd: number): number[] {
  if (!f) return [];
  const out = (f.at_s ?? []).filter((t) => t < tEnd);
  if (f.rate_per_h && f.rate_per_h > 0) {
    const mean = 3600 / f.rate_per_h;
    for (let t = rng.exponential(mean); t < tEnd; t += rng.exponential(mean)) out.push(t);
  }
  return out.sort((a, b) => a - b);
}

function windows(f: (EventFault & { duration_s?: Range; duration_ms?: Range }) | undefined, rng: Rng, tEnd: number): Window[] {
  const starts = arrivals(f, rng, tEnd);
  const r: Range = f?.duration_s ?? (f?.duration_ms ? [f.duration_ms[0] / 1000, f.duration_ms[1] / 1000] : [0, 0]);
  const out: Window[] = [];
  for (const start of starts) {
    const w = { start, end: start + rng.between(r[0], r[1]) };
    // Windows of one kind never overlap: a second one starting inside the first merges into it.
    const last = out[out.length - 1];
    if (last && w.start <= last.end) out[out.length - 1] = { start: last.start, end: Math.max(last.end, w.end) };
    else out.push(w);
  }
  return out;
}

/** Draws the schedule for a run of `tEnd` seconds. */
export function drawFaultSchedule(faults: Faults, seed: number, tEnd: number): FaultSchedule {
  const rng = new Rng(seed, 'fault-schedule');
  const disconnects = windows(faults.disconnect, rng.fork('disconnect'), tEnd);
  const reboots = arrivals(faults.reboot, rng.fork('reboot'), tEnd).map((t) => ({ t, cause: faults.reboot?.cause ?? 'watchdog' }));
  if (faults.disconnect?.reset_on_connect) for (const d of disconnects) if (d.end < tEnd) reboots.push({ t: d.end, cause: 'external' });
  reboots.sort((a, b) => a.t - b.t);
  // Objects may overlap each other; they are kept apart so that each is counted.
  const objRng = rng.fork('object');
  const objects = arrivals(faults.object, objRng, tEnd).map((start) => {
    const d = faults.object!.duration_ms;
    return { start, end: start + objRng.between(d[0], d[1]) / 1000 };
  });
  return {
    reboots,
    stalls: windows(faults.stall, rng.fork('stall'), tEnd),
    drops: windows(faults.device_drop, rng.fork('drop'), tEnd),
    disconnects,
    objects,
  };
}
