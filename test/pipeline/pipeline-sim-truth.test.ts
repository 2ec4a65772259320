// Single runs against the simulator's truth: amplitude, clock rate, B, a dying swing (coverage over seeds: *-coverage).
import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../sim/index.ts';
import { scenario, simAndAnalyze, truthAmplitudeAt } from './sim-run.ts';

const DEG = 180 / Math.PI;

describe('against the simulator truth', () => {
  it.each([3, 10, 30, 60])('amplitude per swing within 0.05° at %f° when w is exact', (deg) => {
    const sc = scenario({
      name: `amp-${deg}`,
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 120,
      physics: { g_m_s2: 9.80665, release_deg: deg, linear_q: 3000 },
      gate: { offset_m: 0, blocking_delay_us: 4, unblocking_delay_us: 4, jitter_us: 1 },
    });
    const { truth, result: r } = simAndAnalyze(sc, { seed: deg }, { clock: 'nominal' });
    let n = 0;
    for (const s of r.swings) {
      if (s.amplitude_deg === null) continue;
      n++;
      expect(Math.abs(s.amplitude_deg - truthAmplitudeAt(truth, s.t_s) * DEG)).toBeLessThan(0.05);
    }
    expect(n).toBeGreaterThan(100);
  });

  it('amplitude within 0.05° through a decay from 60° to 3°', () => {
    const sc = scenario({
      name: 'amp-decay',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 560,
      physics: { g_m_s2: 9.80665, release_deg: 60, linear_q: 300 },
      gate: { offset_m: 0, blocking_delay_us: 4, unblocking_delay_us: 4, jitter_us: 1 },
    });
    const { truth, result: r } = simAndAnalyze(sc, { seed: 9 });
    let worst = 0;
    for (const s of r.swings) {
      if (s.amplitude_deg === null || s.amplitude_deg < 3) continue;
      worst = Math.max(worst, Math.abs(s.amplitude_deg - truthAmplitudeAt(truth, s.t_s) * DEG));
    }
    expect(r.amplitude_start_deg!).toBeGreaterThan(59);
    expect(r.amplitude_end_deg!).toBeLessThan(3.5);
    expect(worst).toBeLessThan(0.05);
  });

  it('clock rate within 2 ppm from a 2-hour run with realistic USB latency', () => {
    const sc = loadScenario('brass-1m-two-hours');
    const { truth, result: r } = simAndAnalyze(sc, { seed: 5 });
    // The device drifts linearly; the run's mean rate is the rate at mid-run.
    const mean = truth.clock.ppm + (truth.clock.drift_ppm_per_h * sc.duration_s) / 2 / 3600;
    expect(r.clock_source).toBe('host');
    expect(Math.abs(r.clock_ppm! - mean)).toBeLessThan(2);
    expect(Math.abs(r.clock_ppm! - mean)).toBeLessThan(Math.max(4 * r.clock_u_ppm!, 0.05));
    expect(r.clock_drift_ppm_per_h!).toBeCloseTo(truth.clock.drift_ppm_per_h, 0);
  });

  it.each([0.0004, -0.0015, 0.003])('gate offset %f m recovered within 0.2 mm, with its sign', (offset) => {
    const brass = loadScenario('brass-1m-two-hours');
    const { result: r } = simAndAnalyze(brass, { seed: 2, durationS: 600, gate_offset_m: offset });
    expect(Math.abs(r.gate_offset_m! - offset)).toBeLessThan(2e-4);
    expect(Math.abs(r.gate_offset_m! - offset)).toBeLessThan(2e-5);
  });

  it('B within 3 % of 1/16 over a 30° → 3° decay', () => {
    const sc = scenario({
      name: 'b-decay',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
      duration_s: 600,
      physics: { g_m_s2: 9.80665, release_deg: 30, linear_q: 400 },
    });
    const { result: r } = simAndAnalyze(sc, { seed: 4 });
    expect(r.amplitude_start_deg!).toBeGreaterThan(29.5);
    expect(r.amplitude_end_deg!).toBeLessThan(3.2);
    expect(Math.abs(r.B! * 16 - 1)).toBeLessThan(0.03);
    expect(r.C).not.toBeNull();
  });

  it('a swing that dies out behind an offset beam is left out without blame, not taken for objects', () => {
    // club-resonator: no faults; the amplitude decays until the bob no longer clears the beam on one side.
    const sc = loadScenario('club-resonator');
    const { truth, result: r } = simAndAnalyze(sc, { seed: 1 });
    expect(truth.faults.counts.objects).toBe(0);
    expect(r.counts.rejected_passes).toBe(0);
    expect(r.counts.long_gaps).toBe(0);
    expect(r.counts.unsequenced_passes!).toBeGreaterThan(10);
    expect(r.warnings.map(warningText).some((w) => /no longer cleared the beam/.test(w))).toBe(true);
    // A resonator 3000 ppm fast drifting 20 ppm/h: the run's mean rate is the mid-run rate.
    expect(Math.abs(r.clock_ppm! - (truth.clock.ppm + (truth.clock.drift_ppm_per_h * sc.duration_s) / 2 / 3600))).toBeLessThan(2);
    expect(Math.abs(r.gate_offset_m! - truth.gate.offset_m)).toBeLessThan(2e-4);
  });
});
