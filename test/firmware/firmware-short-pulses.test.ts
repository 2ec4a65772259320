// Pulses too short for the firmware to see both edges: the missed edge is counted in `lost`, never
// silent, and the edge polarity stays right afterwards.
import { expect, it } from 'vitest';
import { CH0_MIN_PULSE_TICKS } from '../../protocol/link-defaults.ts';
import { EMULATOR_HZ, runFirmware, type FirmwareEdge } from '../../sim/emulator/run-firmware.ts';
import { decodeRun, edgesOf, heartbeatsOf } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

describeFirmware('short pulses', () => {
  it('ch0: pulses from CH0_MIN_PULSE_TICKS up come back whole; each shorter one counts one lost edge', async () => {
    const widths = [10, 20, CH0_MIN_PULSE_TICKS - 1, CH0_MIN_PULSE_TICKS, 30, 40, 46, 60, 80, 200];
    const edges: FirmwareEdge[] = [];
    widths.forEach((w, i) => {
      const rise = Math.round((0.2 + i * 0.01) * EMULATOR_HZ);
      edges.push({ t_s: rise / EMULATOR_HZ, ch: 0, level: 1 }, { t_s: (rise + w) / EMULATOR_HZ, ch: 0, level: 0 });
    });
    // An ordinary pulse afterwards must still read r then f.
    edges.push({ t_s: 0.5, ch: 0, level: 1 }, { t_s: 0.51, ch: 0, level: 0 });
    const run = await runFirmware({ edges, durationS: 1.3 });
    const records = decodeRun(run);
    const short = widths.filter((w) => w < CH0_MIN_PULSE_TICKS).length;
    expect(heartbeatsOf(records).at(-1)!.lost).toBe(short);
    const got = edgesOf(records, 0);
    expect(got).toHaveLength(2 * widths.length + 2 - short);
    // Every reported edge is a real one with the right polarity, exact to the tick.
    const real = new Map(run.applied.map((a) => [a.cycle - run.timer1StartCycle, a.level ? 'r' : 'f']));
    for (const e of got) expect(real.get(e.ticks)).toBe(e.edge);
    expect(got.slice(-2).map((e) => e.edge)).toEqual(['r', 'f']);
  });

  it('ch0: a 5 µs pulse comes back whole even when it starts while the overflow ISR runs', async () => {
    const start = (await runFirmware({ edges: [], durationS: 0.05 })).timer1StartCycle;
    const edges: FirmwareEdge[] = [];
    const offsets = Array.from({ length: 91 }, (_, i) => i - 10); // −10 … +80 cycles from the overflow
    offsets.forEach((k, i) => {
      const rise = start + (20 + 2 * i) * 65536 + k;
      edges.push({ t_s: rise / EMULATOR_HZ, ch: 0, level: 1 }, { t_s: (rise + 80) / EMULATOR_HZ, ch: 0, level: 0 });
    });
    const run = await runFirmware({ edges, durationS: (start + 220 * 65536) / EMULATOR_HZ + 1.1 });
    const records = decodeRun(run);
    expect(heartbeatsOf(records).at(-1)!.lost).toBe(0);
    expect(edgesOf(records, 0)).toHaveLength(2 * offsets.length);
  });

  it('ch1: two changes closer than the interrupt can look count as two lost edges', async () => {
    const edges: FirmwareEdge[] = [];
    for (let i = 0; i < 5; i++) {
      const at = Math.round((0.2 + i * 0.01) * EMULATOR_HZ);
      edges.push({ t_s: at / EMULATOR_HZ, ch: 1, level: 1 }, { t_s: (at + 2) / EMULATOR_HZ, ch: 1, level: 0 });
    }
    edges.push({ t_s: 0.5, ch: 1, level: 1 }, { t_s: 0.51, ch: 1, level: 0 });
    const run = await runFirmware({ edges, durationS: 1.3 });
    const records = decodeRun(run);
    expect(heartbeatsOf(records).at(-1)!.lost).toBe(10);
    expect(edgesOf(records, 1).map((e) => e.edge)).toEqual(['r', 'f']);
  });
});

describeFirmware('short pulses while a line is being sent', () => {
  // The capture vector cannot run while another interrupt does: a rise that comes while the transmit (UDRE)
  // interrupt runs (about 58 cycles, compiled) is latched by the hardware at once, but the edge-select flip
  // waits for that interrupt, so a pulse there needs more than CH0_MIN_PULSE_TICKS. The second edge of a
  // shorter one is counted lost, never silent (hardware-notes/firmware.md §5 has the figures).
  it('ch0: 5 µs pulses across a heartbeat line: each comes back whole or its second edge is counted lost', async () => {
    const commands = [{ t_s: 0.06, text: 'P 100\n' }, { t_s: 0.07, text: 'A 0\n' }];
    const n = 2000;
    const durationS = 0.5 + n * 0.1 + 0.3;
    const probe = await runFirmware({ edges: [], durationS, commands });
    const beats = decodeRun(probe)
      .filter((r) => r.kind === 'T')
      .map((r) => (r as { ticks: number }).ticks + probe.timer1StartCycle)
      .filter((c) => c > 0.4 * EMULATOR_HZ);
    // Pulse i rises 10·i cycles after the i-th heartbeat was formatted: over the first 20 000 cycles of its line.
    const rises = Array.from({ length: n }, (_, i) => beats[i]! + 10 * i);
    const edges = rises.flatMap((r) => [
      { t_s: r / EMULATOR_HZ, ch: 0 as const, level: 1 as const },
      { t_s: (r + 80) / EMULATOR_HZ, ch: 0 as const, level: 0 as const },
    ]);
    const run = await runFirmware({ edges, durationS, commands });
    const records = decodeRun(run);
    const got = edgesOf(records, 0);
    const lost = heartbeatsOf(records).at(-1)!.lost;
    console.log(`5 µs pulses across a line: ${n} pulses, ${got.length} edges returned, ${lost} counted lost`);
    expect(got.length + lost).toBe(2 * n);
    // Every returned edge is exact; every rise comes back, so what is lost is always a pulse's second edge.
    const real = new Map(run.applied.map((a) => [a.cycle - run.timer1StartCycle, a.level ? 'r' : 'f']));
    for (const e of got) expect(real.get(e.ticks), `edge at ${e.ticks}`).toBe(e.edge);
    expect(got.filter((e) => e.edge === 'r')).toHaveLength(n);
    // The documented behaviour: 80 cycles is not always enough while a line is sent (it is when idle).
    expect(lost).toBeGreaterThan(0);
  }, 120_000);
});
