// The photogate's output pin: bob and stray objects blocking the beam, sensor delays, jitter and bounce.
import type { BobEvent } from './swing.ts';
import type { Window } from './fault-schedule.ts';
import type { Faults, Scenario } from './scenario.ts';
import type { Rng } from './prng.ts';
import type { FaultCounts } from './truth.ts';

/** A level change of the gate output, true seconds. */
export interface PinEdge {
  readonly t: number;
  readonly level: 0 | 1;
  /** The device channel, when a run has more than one beam (else the rig's channel). */
  readonly ch?: number;
}

export interface OpticsSetup {
  readonly gate: Scenario['gate'];
  readonly blockedLevel: 0 | 1;
  readonly bounce: Faults['bounce'];
  /** Stray objects, sorted by start. */
  readonly objects: readonly Window[];
  readonly bobStartsBlocked: boolean;
  /** Offset added to bob event times (release time on the host clock). */
  readonly t0: number;
}

/** The pin level before any edge. */
export function initialLevel(s: OpticsSetup): 0 | 1 {
  const blocked = s.bobStartsBlocked || s.objects.some((o) => o.start <= 0 && o.end > 0);
  return blocked ? s.blockedLevel : ((1 - s.blockedLevel) as 0 | 1);
}

/**
 * Yields pin edges in time order. `onBob` sees every bob event (for the truth file) as it is consumed.
 * A bounce pulse that would reach the next real transition is left out (and not counted).
 */
export function* pinEdges(
  s: OpticsSetup,
  bob: Iterator<BobEvent>,
  rng: Rng,
  counts: FaultCounts,
  onBob: (e: BobEvent) => void,
): Generator<PinEdge> {
  const jitterS = s.gate.jitter_us * 1e-6;
  const bounceRng = rng.fork('bounce');
  let bobIn = s.bobStartsBlocked ? 1 : 0;
  let blockers = bobIn + s.objects.filter((o) => o.start <= 0 && o.end > 0).length;
  const ends: number[] = s.objects.filter((o) => o.start <= 0 && o.end > 0).map((o) => o.end);
  let oi = s.objects.findIndex((o) => o.start > 0);
  if (oi < 0) oi = s.objects.length;
  let nextBob = nextZoneEvent(bob, onBob);
  let lastOut = -Infinity;
  let bounce: PinEdge[] = [];

  for (;;) {
    const tBob = nextBob ? nextBob.t + s.t0 : Infinity;
    const tObjStart = oi < s.objects.length ? s.objects[oi]!.start : Infinity;
    const tObjEnd = ends.length ? Math.min(...ends) : Infinity;
    const t = Math.min(tBob, tObjStart, tObjEnd);
    if (t === Infinity) break;
    const before = blockers;
    if (t === tBob) {
      bobIn = nextBob!.kind === 'enter' ? 1 : 0;
      blockers += bobIn ? 1 : -1;
      nextBob = nextZoneEvent(bob, onBob);
    } else if (t === tObjStart) {
      ends.push(s.objects[oi]!.end);
      counts.objects++;
      oi++;
      blockers++;
    } else {
      ends.splice(ends.indexOf(tObjEnd), 1);
      blockers--;
    }
    if ((before > 0) === (blockers > 0)) continue;
    const blocked = blockers > 0;
    const delay = (blocked ? s.gate.blocking_delay_us : s.gate.unblocking_delay_us) * 1e-6;
    const tOut = Math.max(t + delay + (jitterS > 0 ? jitterS * rng.normal() : 0), lastOut + 1e-9);
    for (const e of flushBounce(bounce, tOut, counts)) yield e;
    const level = blocked ? s.blockedLevel : ((1 - s.blockedLevel) as 0 | 1);
    lastOut = tOut;
    yield { t: tOut, level };
    bounce = s.bounce && bounceRng.chance(s.bounce.probability) ? drawBounce(s.bounce, tOut, level, bounceRng) : [];
  }
  for (const e of flushBounce(bounce, Infinity, counts)) yield e;
}

function nextZoneEvent(bob: Iterator<BobEvent>, onBob: (e: BobEvent) => void): (BobEvent & { kind: 'enter' | 'exit' }) | undefined {
  for (;;) {
    const r = bob.next();
    if (r.done) return undefined;
    onBob(r.value);
    if (r.value.kind === 'enter' || r.value.kind === 'exit') return r.value as BobEvent & { kind: 'enter' | 'exit' };
  }
}

function drawBounce(b: NonNullable<Faults['bounce']>, t0: number, level: 0 | 1, rng: Rng): PinEdge[] {
  const n = rng.int(Math.round(b.pulses[0]), Math.round(b.pulses[1]));
  const out: PinEdge[] = [];
  let t = t0;
  for (let i = 0; i < n; i++) {
    t += Math.max(1e-9, rng.between(b.gap_us[0], b.gap_us[1]) * 1e-6);
    out.push({ t, level: (1 - level) as 0 | 1 });
    t += Math.max(1e-9, rng.between(b.width_us[0], b.width_us[1]) * 1e-6);
    out.push({ t, level });
  }
  return out;
}

function* flushBounce(pulses: PinEdge[], before: number, counts: FaultCounts): Generator<PinEdge> {
  for (let i = 0; i + 1 < pulses.length; i += 2) {
    if (pulses[i + 1]!.t >= before) return;
    counts.bounce_pulses++;
    yield pulses[i]!;
    yield pulses[i + 1]!;
  }
}
