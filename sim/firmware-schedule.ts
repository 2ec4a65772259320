// A scenario as a firmware input schedule: the gate's level changes in the device's own seconds since boot.
import type { Scenario } from './scenario.ts';
import { DeviceClock } from './device-clock.ts';
import { simulatePinEdges, type SimOptions } from './simulate.ts';

/** One input level change for the emulator harness (shape of sim/emulator/run-firmware.ts FirmwareEdge). */
export interface ScheduleEdge {
  readonly t_s: number;
  readonly ch: 0 | 1;
  readonly level: 0 | 1;
}

export interface FirmwareSchedule {
  /** Level changes in emulated seconds since reset; both inputs start low, so a high start is a change at 0. */
  readonly edges: ScheduleEdge[];
  /** Emulated run length covering every edge plus one heartbeat period. */
  readonly durationS: number;
  /** Device ticks of each pin edge on a phase-0 clock, before any capture loss (index-aligned with the non-initial edges). */
  readonly modelTicks: number[];
  /** The ticks of emulated time `leadS` (the schedule's origin maps to device tick round(leadS·hz)). */
  readonly leadS: number;
}

/**
 * Converts a scenario's first `durationS` seconds into a harness schedule. Edge times are taken on the device's
 * clock (its ppm and drift applied), so an emulator running at exactly `hz` sees them at the ticks the modelled
 * device would: the firmware and the model can be compared tick for tick. `leadS` lets the firmware boot first.
 */
export function firmwareSchedule(scenario: Scenario, opts: SimOptions & { leadS?: number }): FirmwareSchedule {
  const leadS = opts.leadS ?? 0.05;
  // Only the faults that happen at the pin (bounce, objects) can reach a real firmware through its input.
  const pinOnly: Scenario = { ...scenario, faults: { bounce: scenario.faults.bounce, object: scenario.faults.object } };
  const { edges, initialLevel, scenario: sc } = simulatePinEdges(pinOnly, { ...opts, no_faults: opts.no_faults ?? false });
  const d = sc.device;
  if (sc.rig.beams[0].channel > 1) throw new RangeError('the emulated board has channels 0 and 1 only');
  const ch = sc.rig.beams[0].channel as 0 | 1;
  const boot = d.first_boot_s;
  // Phase 0: device tick n is emulated time n/hz after the schedule's origin.
  const clock = new DeviceClock(d.hz, d.ppm, d.drift_ppm_per_h, boot, 0);
  const out: ScheduleEdge[] = initialLevel ? [{ t_s: 0, ch, level: 1 }] : [];
  const modelTicks: number[] = [];
  let last = 0;
  for (const e of edges) {
    if (e.t <= boot) continue;
    const ticks = clock.ticksAt(e.t);
    out.push({ t_s: leadS + ticks / d.hz, ch, level: e.level });
    modelTicks.push(Math.floor(ticks) + d.capture_latency_ticks);
    last = leadS + ticks / d.hz;
  }
  return { edges: out, durationS: last + d.heartbeat_ms / 1000 + 0.1, modelTicks, leadS };
}
