// One scenario through the real firmware (simavr harness) and through the in-process device model: same edges.
import { expect, it } from 'vitest';
import { decodeLine, type EdgeRecord } from '../../protocol/index.ts';
import { firmwareSchedule, loadScenario, parseScenario, simulateDevice } from '../../sim/index.ts';
import { runFirmware } from '../../sim/emulator/run-firmware.ts';
import { describeFirmware } from '../firmware/toolchain-gate.ts';
import { EMULATOR_CHANNEL_LATENCY_TICKS } from '../../protocol/link-defaults.ts';
import type { Scenario } from '../../sim/index.ts';

/** simavr models no input synchroniser or noise canceller: the emulated part's ch0 latency is 0, not silicon's 4. */
const emulated = (s: Scenario): Scenario => ({ ...s, device: { ...s.device, capture_latency_ticks: EMULATOR_CHANNEL_LATENCY_TICKS[0] } });

describeFirmware('scenario through the emulated firmware vs the device model', () => {
  it('club rig, +3000 ppm clock: the same edges in the same order, ticks within ±1 (plus simavr’s instruction-boundary delay)', async () => {
    const scenario = emulated(loadScenario('club-resonator'));
    const opts = { seed: 9, durationS: 8, no_faults: true };
    const sch = firmwareSchedule(scenario, opts);
    const fw = await runFirmware({ edges: sch.edges, durationS: sch.durationS });

    const fwEdges = fw.lines.map(decodeLine).flatMap((d) => (d.ok && d.record.kind === 'E' ? [d.record as EdgeRecord] : []));
    // The model's own E lines for the same run (its clock phase differs; ticks are compared after the schedule's origin).
    const { device } = simulateDevice(scenario, opts);
    const modelEdges: EdgeRecord[] = [];
    for (let l = device.pop(); l; l = device.pop()) {
      const d = decodeLine(l.line);
      if (d.ok && d.record.kind === 'E') modelEdges.push(d.record as EdgeRecord);
    }
    expect(fwEdges.length).toBeGreaterThanOrEqual(10);
    expect(fwEdges.length).toBe(modelEdges.length);
    expect(fwEdges.map((e) => `${e.ch}${e.edge}`)).toEqual(modelEdges.map((e) => `${e.ch}${e.edge}`));

    const origin = Math.round(sch.leadS * fw.hz) - fw.timer1StartCycle;
    const applied = fw.applied.filter((a) => a.cycle > 0);
    let worst = 0;
    let worstLate = 0;
    fwEdges.forEach((e, i) => {
      // simavr applies a pin change at the next instruction boundary: that lateness is the harness's, not the model's.
      const late = applied[i]!.cycle - Math.round(sch.edges[i + (sch.edges[0]!.t_s === 0 ? 1 : 0)]!.t_s * fw.hz);
      const d = e.ticks - (sch.modelTicks[i]! + origin) - late;
      worst = Math.max(worst, Math.abs(d));
      worstLate = Math.max(worstLate, late);
      expect(Math.abs(d)).toBeLessThanOrEqual(1);
      // And the firmware's capture against the change it really saw: exact to a tick.
      expect(Math.abs(e.ticks - (applied[i]!.cycle - fw.timer1StartCycle))).toBeLessThanOrEqual(1);
    });
    console.log(`sim vs emulator: ${fwEdges.length} edges, worst |Δticks| = ${worst} after simavr's apply delay (≤ ${worstLate} cycles)`);
    // The model's own lines carry the same device-clock intervals as the firmware's (phase aside).
    for (let i = 1; i < fwEdges.length; i++) {
      const dm = modelEdges[i]!.ticks - modelEdges[i - 1]!.ticks;
      const df = fwEdges[i]!.ticks - fwEdges[i - 1]!.ticks;
      expect(Math.abs(dm - df)).toBeLessThanOrEqual(2 + worstLate);
    }
  });
});

describeFirmware('short bounce pulses: the model loses the same edges as the firmware', () => {
  it('edges in the capture ISR’s blind time are lost by both, `lost` counts the same, the rest match in order', async () => {
    // Widths 0.5–1.2 µs (8–19 ticks, under the blind time), gaps 20–60 µs (far past the ISR's pin check, whose
    // exact time varies by tens of cycles with what the main loop is doing): no case sits near either threshold.
    const base = emulated(loadScenario('club-resonator'));
    const scenario = { ...base, faults: { bounce: { probability: 1, pulses: [1, 2] as const, width_us: [0.5, 1.2] as const, gap_us: [20, 60] as const } } };
    const opts = { seed: 21, durationS: 6 };
    const sch = firmwareSchedule(scenario, opts);
    const fw = await runFirmware({ edges: sch.edges, durationS: sch.durationS });
    const fwRecs = fw.lines.map(decodeLine).flatMap((d) => (d.ok ? [d.record] : []));
    const { device, truth } = simulateDevice(scenario, opts);
    const modelRecs = [];
    for (let l = device.pop(); l; l = device.pop()) {
      const d = decodeLine(l.line);
      if (d.ok) modelRecs.push(d.record);
    }
    const seqOf = (rs: typeof fwRecs) => rs.flatMap((r) => (r.kind === 'E' ? [`${r.ch}${r.edge}`] : []));
    const lostOf = (rs: typeof fwRecs) => rs.flatMap((r) => (r.kind === 'T' ? [r.lost] : []));
    expect(truth.faults.counts.bounce_pulses).toBeGreaterThanOrEqual(5);
    const c = truth.faults.counts;
    expect(c.edges_lost_too_close).toBeGreaterThanOrEqual(c.bounce_pulses);
    expect(seqOf(modelRecs)).toEqual(seqOf(fwRecs));
    // Heartbeat by heartbeat the same `lost`; the emulated run goes on a little longer, past the last edge.
    const fwLost = lostOf(fwRecs);
    const modelLost = lostOf(modelRecs);
    expect(modelLost.length).toBeGreaterThanOrEqual(4);
    expect(fwLost.slice(0, modelLost.length)).toEqual(modelLost);
    expect(fwLost.at(-1)).toBe(c.edges_lost_by_device);
    expect(c.edges_lost_by_device).toBeGreaterThan(0);
    expect(c.edges_lost_by_device + c.edges_lost_silently).toBe(c.edges_lost_too_close);
    // The firmware counts every edge it misses in its blind time (it used to lose a missed pulse silently).
    expect(c.edges_lost_silently).toBe(0);
    console.log(`sim vs emulator, bounce: ${c.bounce_pulses} pulses, ${c.edges_lost_too_close} edges missed, ${c.edges_lost_silently} of them never counted by either`);
  });
});

describeFirmware('the model\'s capture blind time is the current firmware\'s', () => {
  it('pulses 2 ticks under min_edge_gap_ticks lose their end, 2 over are whole; edges missed before pin_check_ticks are counted', async () => {
    const d = parseScenario({ rig: { length_m: 1, flag_width_m: 0.02 }, duration_s: 1, physics: { g_m_s2: 9.8, release_deg: 10 } }).device;
    const g = d.min_edge_gap_ticks;
    // Each probe: rise at a 10 ms slot, then the listed offsets (ticks after that rise) alternate fall, rise, ...; the last fall ends it.
    const probes = [[g - 2], [g + 2], [20, d.pin_check_ticks - 25, 2000], [20, d.pin_check_ticks + 25, 2000], [20, 60, 90, 2000, 4000]];
    const edges = probes.flatMap((offs, i) => {
      const c = Math.round((0.2 + i * 0.01) * 16e6);
      return [0, ...offs].map((o, k) => ({ t_s: (c + o) / 16e6, ch: 0 as const, level: (k % 2 === 0 ? 1 : 0) as 0 | 1 }));
    });
    const fw = await runFirmware({ edges, durationS: 1.3 });
    const recs = fw.lines.map(decodeLine).flatMap((x) => (x.ok ? [x.record] : []));
    const per = probes.map((_, i) => {
      const t0 = Math.round((0.2 + i * 0.01) * 16e6) - fw.timer1StartCycle;
      return recs.flatMap((r) => (r.kind === 'E' && r.ticks >= t0 - 8 && r.ticks < t0 + 5000 ? [r.edge] : [])).join('');
    });
    const lost = recs.flatMap((r) => (r.kind === 'T' ? [r.lost] : [])).at(-1);
    console.log(`firmware blind time: probes at ${g - 2}/${g + 2} ticks and pin check ${d.pin_check_ticks}: ${per.join(' ')}, lost ${lost}`);
    // 1 + 2 + 1 + 2 lost; in the last probe the fall at 90 ticks, after two missed edges, is captured.
    expect(per).toEqual(['r', 'rf', 'rf', 'rrf', 'rfrf']);
    expect(lost).toBe(6);
  });
});
