// The length's temperature coefficient and T0 at the reference temperature, from a simulated 8-hour run in a
// room with a ±2 K cycle and a brass-ish string: the simulator's truth against the fit, through the pipeline.
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import type { AirRecord } from '../../protocol/records.ts';
import { airDensityCipm2007 } from '../../host/analysis/air-density.ts';
import { airPeriodFactor, fitLengthDrift, lengthAt, roomAtTime, type RoomReading } from '../../host/analysis/room-drift.ts';
import { physicsIn, roomAt } from '../../sim/room.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { scenario, simAndAnalyze } from '../pipeline/sim-run.ts';

const ALPHA = 18e-6; // brass-ish (docs/references.md#ref-air-density, handbook value from memory)

describe('length temperature coefficient from the period drift', () => {
  it('airPeriodFactor is the buoyancy and added-mass law: 1 + (1 + k)ρ/(2ρ_b) to first order', () => {
    const rho = airDensityCipm2007({ tempC: 20, pressPa: 101325, rhPct: 50 });
    expect(airPeriodFactor(rho, 8000, 0.5) - 1).toBeCloseTo((1.5 * rho) / 16000, 7);
    expect(roomAtTime([{ t_s: 0, tempC: 20, pressPa: 1e5, rhPct: 40 }, { t_s: 10, tempC: 22, pressPa: 1e5, rhPct: 50 }], 5).tempC).toBe(21);
  });

  it('8 h, ±2 K, 18 ppm/K: α within its uncertainty (u ≤ 3 ppm/K) and g within 2e-5 of the truth', () => {
    const sc = scenario({
      name: 'room-8h',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254, bob_density_kg_m3: 8400, length_u_m: 0.0005 },
      duration_s: 8 * 3600,
      physics: { g_m_s2: 9.80665, release_deg: 6, linear_q: 40000 },
      gate: { offset_m: 0.0004, jitter_us: 2 },
      room: { temp_period_h: 8, temp_amp_K: 2, expansion_per_K: ALPHA, length_temp_C: 20, front_at_h: 5 },
    });
    const { entries, result } = simAndAnalyze(sc, { seed: 5 });
    const readings: RoomReading[] = [];
    for (const e of entries) {
      if (e.kind !== 'data') continue;
      const d = decodeLine(e.line);
      if (d.ok && d.record.kind === 'A') readings.push({ t_s: e.hostUs / 1e6, tempC: d.record.temp / 100, pressPa: d.record.press, rhPct: d.record.hum / 1000 });
    }
    expect(readings.length).toBeGreaterThan(2800);
    const periods = result.swings.filter((r) => r.period0_s !== null && r.flags.length === 0).map((r) => ({ t_s: r.t_s, T0_s: r.period0_s!, amplitude_rad: ((r.amplitude_deg ?? 0) * Math.PI) / 180 }));
    const fit = fitLengthDrift(periods, readings, { bobDensity: 8400 })!;
    expect(fit.alpha_u_per_K).toBeLessThanOrEqual(3e-6);
    expect(Math.abs(fit.alpha_per_K - ALPHA)).toBeLessThanOrEqual(2 * fit.alpha_u_per_K);
    // g ∝ L/T0²: the other corrections are the same factors in truth and estimate, so compare those two.
    const mean = readings.reduce((s, r) => s + r.pressPa, 0) / readings.length;
    const rh = readings.reduce((s, r) => s + r.rhPct, 0) / readings.length;
    const truthT0 = physicsIn(sc, sc.room!, { tempC: fit.reference_temperature_C, pressPa: mean, rhPct: rh }).T0_s;
    const lTrue = lengthAt(1, 20, ALPHA, fit.reference_temperature_C);
    const lEst = lengthAt(1, 20, fit.alpha_per_K, fit.reference_temperature_C);
    const gRatio = (lEst / lTrue) * (truthT0 / fit.T0_ref_s) ** 2;
    expect(Math.abs(gRatio - 1)).toBeLessThan(2e-5);
    expect(roomAt(sc.room!, 2 * 3600).tempC).toBeCloseTo(23, 6);
    // The same through analyze's result (`environment`, the contract keys).
    const env = result.environment!;
    expect(Object.keys(env).sort()).toEqual(['air_density_kg_m3', 'humidity_mean_pct', 'length_temp_coeff_ppm_per_K', 'length_temp_coeff_u_ppm_per_K', 'pressure_mean_Pa', 'reference_temperature_C', 'temperature_max_C', 'temperature_mean_C', 'temperature_min_C']);
    expect(env.length_temp_coeff_u_ppm_per_K!).toBeLessThanOrEqual(3);
    expect(Math.abs(env.length_temp_coeff_ppm_per_K! - ALPHA * 1e6)).toBeLessThanOrEqual(2 * env.length_temp_coeff_u_ppm_per_K!);
    expect(env.temperature_max_C - env.temperature_min_C).toBeGreaterThan(3.9);
    expect(env.air_density_kg_m3).toBeCloseTo(airDensityCipm2007({ tempC: env.temperature_mean_C, pressPa: env.pressure_mean_Pa, rhPct: env.humidity_mean_pct }), 12);
  }, 120_000);

  it('A readings are placed by their ticks (when the sensor was read), not by when their lines arrived', () => {
    // A 6-minute cycle and a large coefficient, so that a minute of misplacement would halve the coefficient
    // (cos 60°). Each reading's line then carries the ticks and values of the reading six before it: a board
    // that sent its readings 60 s after taking them (the lines keep their order and sequence numbers).
    const sc = scenario({
      name: 'room-fast',
      rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254, bob_density_kg_m3: 8400 },
      duration_s: 1500,
      physics: { g_m_s2: 9.80665, release_deg: 6, linear_q: 40000 },
      gate: { jitter_us: 2 },
      room: { temp_period_h: 0.1, temp_amp_K: 2, expansion_per_K: 1e-4, front_Pa: 0 },
    });
    const { entries, result } = simAndAnalyze(sc, { seed: 2 });
    const taken: AirRecord[] = [];
    const late = entries.flatMap((e) => {
      const d = e.kind === 'data' ? decodeLine(e.line) : null;
      if (!d?.ok || d.record.kind !== 'A') return [e];
      taken.push(d.record);
      const held = taken.at(-7);
      return held ? [{ ...e, line: encodeRecord({ ...held, seq: d.record.seq }) }] : [];
    });
    for (const r of [result, analyzeEntries(late)]) {
      const env = r.environment!;
      // Placed by arrival, the late run gave 51 ± 36 ppm/K (the misplaced readings' scatter about the line).
      expect(Math.abs(env.length_temp_coeff_ppm_per_K! - 100)).toBeLessThan(1);
      expect(env.length_temp_coeff_u_ppm_per_K!).toBeLessThan(1);
    }
  }, 60_000);
});
