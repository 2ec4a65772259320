import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { scenario, simAndAnalyze } from './sim-run.ts';

const base = {
  rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
  duration_s: 1800,
  physics: { g_m_s2: 9.81, release_deg: 20, linear_q: 5000 },
  gate: { offset_m: 0.0005 },
};
// Faults of the wire and the device, at rates high enough to occur several times in half an hour.
const lineFaults = scenario({
  ...base,
  name: 'line-faults',
  faults: {
    lost_lines: { probability: 0.001 },
    corrupt: { probability: 0.002 },
    reboot: { at_s: [600], cause: 'watchdog' },
    disconnect: { at_s: [1200], duration_s: [3, 6], reset_on_connect: false },
    device_drop: { rate_per_h: 12, duration_ms: [300, 900] },
    stall: { at_s: [1500], duration_s: [2, 4] },
  },
});
// Faults of the optics: detector chatter and objects through the beam.
const opticFaults = scenario({
  ...base,
  name: 'optic-faults',
  faults: {
    bounce: { probability: 0.02, pulses: [1, 3], width_us: [10, 150], gap_us: [10, 80] },
    object: { at_s: [300.2, 1000], rate_per_h: 6, duration_ms: [30, 200] },
  },
});

/** No period may come out wrong because of a fault. */
function periodsSound(r: ReturnType<typeof simAndAnalyze>): void {
  const T0 = r.truth.physics.T0_s;
  for (const s of r.result.swings) if (s.period0_s !== null) expect(Math.abs(s.period0_s / T0 - 1)).toBeLessThan(1e-4);
  expect(r.result.periods).toBeGreaterThan(1500);
}

describe('each injected fault is counted exactly (simulator truth)', () => {
  it.each([1, 2, 3, 14])('wire and device faults, seed %i', (seed) => {
    const run = simAndAnalyze(lineFaults, { seed });
    const f = run.truth.faults.counts;
    const c = run.result.counts;
    // A damaged line fails its checksum, or (when the damage hits the checksum field itself) its syntax.
    expect(c.crc_errors + c.bad_lines).toBe(f.lines_corrupted);
    expect(f.lines_corrupted).toBeGreaterThan(0);
    // Lines missing from a boot's sequence: lost on the wire, or sent while the port was away (no reset).
    expect(c.lines_lost).toBe(f.lines_lost + f.lines_in_disconnect);
    expect(c.device_lost).toBe(f.edges_lost_by_device);
    expect(c.reboots).toBe(f.reboots);
    expect(c.disconnects).toBe(f.disconnects);
    expect(c.rejected_passes).toBe(0);
    periodsSound(run);
  });

  it.each([1, 2, 3])('optical faults, seed %i', (seed) => {
    const run = simAndAnalyze(opticFaults, { seed });
    const f = run.truth.faults.counts;
    expect(run.result.counts.bounces).toBe(f.bounce_pulses);
    expect(run.result.counts.glitches).toBe(0);
    expect(run.result.counts.rejected_passes).toBe(f.objects);
    expect(f.objects).toBeGreaterThan(1);
    expect(run.result.warnings.map(warningText).some((w) => /object through the beam/.test(w))).toBe(true);
    periodsSound(run);
  });
});
