// Heartbeats and 1 PPS pulses as the clock fit reads them, and the clock chosen from them for the pass times.
import type { Warning } from '../analysis/warning.ts';
import { bootOffsets, bootOffsetsWith, type BootHeartbeats, type BootPps } from '../analysis/clock-calibration.ts';
import { trackedSeconds } from '../analysis/clock-track.ts';
import type { ClockApplied } from '../analysis/passes.ts';
import type { BootOffsets } from './boot-timebase.ts';
import { chooseClock, type ClockOption } from './clock-choice.ts';
import { F64Column, I32Column } from './growable.ts';

/** The clock applied to the passes: the choice, each boot's host offset, the rate factor k = 1 + ppm·1e-6. */
export interface RunClock {
  readonly clock: ClockApplied;
  readonly offsets: BootOffsets;
  readonly k: number;
  /** The heartbeats it was fitted on, per boot. */
  readonly beats: readonly BootHeartbeats[];
  /** With a tracked rate: seconds since a boot's tick 0 for its ticks (the integrated rate); null: ticks/(hz·k). */
  readonly since: ((boot: number, ticks: number) => number) | null;
}

/** Heartbeats (boot, ticks, host µs of the line's send start) and PPS pulses (boot, ticks) in arrival order, as compact columns. */
export class ClockInputs {
  private readonly hb = { boot: new I32Column(), ticks: new F64Column(), hostUs: new F64Column() };
  private readonly pps = { boot: new I32Column(), ticks: new F64Column() };

  beat(boot: number, ticks: number, hostUs: number): void {
    this.hb.boot.push(boot);
    this.hb.ticks.push(ticks);
    this.hb.hostUs.push(hostUs);
  }

  pulse(boot: number, ticks: number): void {
    this.pps.boot.push(boot);
    this.pps.ticks.push(ticks);
  }

  /** Heartbeats and pulses so far (a change means the clock must be chosen again). */
  get size(): number {
    return this.hb.boot.length + this.pps.boot.length;
  }

  /** Per boot: heartbeats in nominal device seconds and host seconds, and PPS pulses in ticks. */
  perBoot(boots: number, hz: (b: number) => number): { beats: BootHeartbeats[]; pulses: BootPps[] } {
    const dev: number[][] = Array.from({ length: boots }, () => []);
    const host: number[][] = Array.from({ length: boots }, () => []);
    const pt: number[][] = Array.from({ length: boots }, () => []);
    for (let i = 0; i < this.hb.boot.length; i++) {
      const b = this.hb.boot.at(i);
      if (b < boots) dev[b]!.push(this.hb.ticks.at(i) / hz(b)), host[b]!.push(this.hb.hostUs.at(i) / 1e6);
    }
    for (let i = 0; i < this.pps.boot.length; i++) if (this.pps.boot.at(i) < boots) pt[this.pps.boot.at(i)]!.push(this.pps.ticks.at(i));
    return {
      beats: dev.map((d, b) => ({ boot: b, deviceS: d, hostS: host[b]! })),
      pulses: pt.map((ticks, b) => ({ boot: b, ticks })),
    };
  }

  /** Chooses the clock as the analysis does (warnings explain fallbacks) and the boots' host offsets under it. */
  choose(option: ClockOption, boots: number, hz: (b: number) => number, firstHz: number, warnings: Warning[]): RunClock {
    const { beats, pulses } = this.perBoot(boots, hz);
    const clock = chooseClock(option, beats, pulses, firstHz, warnings);
    // A foreign timebase is not joined on the host clock: each boot starts at its first line (BootTimebase.joiner).
    const offsets = clock.foreign_rate === undefined ? bootOffsets(beats, clock.ppm) : new Map<number, number>();
    const track = clock.track;
    if (!track) return { clock, offsets, k: 1 + clock.ppm * 1e-6, beats, since: null };
    // Tick 0 of each boot on the host clock from the constant rate locates the track (E moves by ppm per second).
    const t0 = bootOffsets(beats, (track.k0 - 1) * 1e6);
    const since = (b: number, ticks: number): number => trackedSeconds(track, t0.get(b) ?? track.from_s, ticks / hz(b));
    const tracked = bootOffsetsWith(beats, (b, x) => since(b, x * hz(b)));
    return { clock, offsets: tracked, k: track.k0, beats, since };
  }
}
