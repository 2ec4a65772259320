// Coverage over seeds of the room's figures against the simulator's truth (npm test only): the length's temperature
// coefficient, and T0 and g at the reference temperature, with a 10 ppm/K resonator whose rate the analysis tracks
// (host/analysis/clock-track.ts) and the rig as measured (sim/measured-rig.ts: the flag width and the length drawn
// with their stated u), so that T0's budget is tested from below as well as from above. k = 2 intervals, bounds
// from the binomial (docs/references.md#ref-coverage-seeds).
import { describe, expect, it } from 'vitest';
import { airDensityCipm2007 } from '../../host/analysis/air-density.ts';
import { stokesAddedMassK } from '../../host/analysis/pendulum-corrections.ts';
import { physicsIn } from '../../sim/room.ts';
import { scenario, simAndAnalyze } from '../pipeline/sim-run.ts';

const ALPHA = 18e-6; // brass-ish (docs/references.md#ref-room-expansion, from memory)
// 20 seeds of 4 hours each: ≈ 28 s on the shared 2-core machine (the rig as measured adds no time).
const SEEDS = 20;

describe('room coverage over seeds', () => {
  it(`α, T0 and g at the reference temperature: the k = 2 interval covers the truth in ≥ 17 of ${SEEDS} seeds, with rms z near 1 for α and T0`, () => {
    // Half of an 8-hour ±2 K cycle (4 h), so each run is short; added mass at the analysis's middle value and a
    // length known to 2 µm, so that g's interval is the room's, the flag's and the timing's work, not the tape measure's.
    const rho = airDensityCipm2007({ tempC: 21, pressPa: 100990, rhPct: 45 });
    const k = (0.5 + stokesAddedMassK(rho, 0.0127, (2 * Math.PI) / 2.00674)) / 2;
    const sc = scenario({
      name: 'room-coverage',
      rig: { length_m: 1, flag_width_m: 0.0254, flag_width_u_m: 2e-4, bob_diameter_m: 0.0254, bob_density_kg_m3: 8400, length_u_m: 2e-6, length_temp_C: 20 },
      duration_s: 4 * 3600,
      physics: { g_m_s2: 9.80665, release_deg: 6, linear_q: 40000, added_mass_k: k },
      gate: { offset_m: 0.0004, jitter_us: 2 },
      room: { temp_period_h: 8, temp_amp_K: 2, expansion_per_K: ALPHA, length_temp_C: 20, front_at_h: 3, clock_tempco_ppm_per_K: 10 },
      measured_rig: true,
    });
    const zA: number[] = [];
    const zT: number[] = [];
    const zG: number[] = [];
    for (let seed = 1; seed <= SEEDS; seed++) {
      const { result } = simAndAnalyze(sc, { seed });
      const env = result.environment!;
      zA.push((env.length_temp_coeff_ppm_per_K! - ALPHA * 1e6) / env.length_temp_coeff_u_ppm_per_K!);
      // T0 at the reference temperature against the simulator's T0 there.
      const truth = physicsIn(sc, sc.room!, { tempC: env.reference_temperature_C, pressPa: env.pressure_mean_Pa, rhPct: env.humidity_mean_pct });
      zT.push((result.T0_s! - truth.T0_s) / result.T0_u_s!);
      zG.push((result.g_m_s2! - 9.80665) / result.g_u_m_s2!);
    }
    const inside = (z: number[]): number => z.filter((v) => Math.abs(v) <= 2).length;
    const rms = (z: number[]): number => Math.sqrt(z.reduce((s, v) => s + v * v, 0) / z.length);
    const line = (name: string, z: number[]): string => `${name} inside ${inside(z)}/${SEEDS} rms z ${rms(z).toFixed(2)} [${z.map((v) => v.toFixed(2)).join(' ')}]`;
    console.log([line('alpha', zA), line('T0', zT), line('g', zG)].join('\n'));
    // Binomial(20, 0.9545): P(≤ 16 inside) = 1.2 %, so a right budget passes ≥ 17 in 99 % of draws.
    for (const z of [zA, zT, zG]) expect(inside(z)).toBeGreaterThanOrEqual(17);
    // rms z of a right budget: 1 ± 1/√(2·20) = 1 ± 0.16 (k = 1); the window leaves room for a budget that is
    // honest but conservative, and catches one that is 60 % too narrow.
    expect(rms(zA)).toBeGreaterThan(0.4);
    expect(rms(zA)).toBeLessThan(1.6);
    // T0's budget is mostly the flag width (its u drawn by the rig as measured) and the sensor delays: measured
    // 5 Dec 2026 rms z 0.96, 19/20 inside (0.02 when the journal stated the true flag width: only its upper side was tested).
    expect(rms(zT)).toBeGreaterThan(0.6);
    expect(rms(zT)).toBeLessThan(1.6);
    // g's budget is dominated by the 10 % rule on the air correction (common practice, no source), which the simulator
    // does not draw (its added mass is the analysis's middle value): measured rms z 0.40, 20/20. A lower bound that
    // catches a budget grossly too wide, not one a little safe.
    expect(rms(zG)).toBeGreaterThan(0.25);
    expect(rms(zG)).toBeLessThan(1.6);
  }, 300_000);
});
