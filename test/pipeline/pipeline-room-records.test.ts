// A and S records (room readings, sensor state) pass through the journal and the pipeline: the same run with and
// without them times to the same figures; the readings add the room to the rows and plots, and their air density
// (CIPM-2007) replaces the rig's constant in the air correction's size.
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { type JournalEntry } from '../../protocol/journal.ts';
import type { AnalysisResult } from '../../host/analysis/result.ts';
import type { DeviceRecord } from '../../protocol/records.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { loadScenario } from '../../sim/index.ts';
import { simAndAnalyze } from './sim-run.ts';

/** Re-numbers the data lines' seq from 0, inserting `extra(record)` lines after chosen records. */
function renumber(entries: readonly JournalEntry[], extra: (r: DeviceRecord, i: number) => DeviceRecord[]): JournalEntry[] {
  let seq = 0;
  const out: JournalEntry[] = [];
  entries.forEach((e, i) => {
    if (e.kind !== 'data') return void out.push(e);
    const d = decodeLine(e.line);
    if (!d.ok) return void out.push(e);
    for (const r of [d.record, ...extra(d.record, i)]) {
      out.push({ ...e, line: encodeRecord({ ...r, seq: seq++ % 0x10000 }) });
    }
  });
  return out;
}

/** The result without what the readings add or resize: the room, its columns and plot, the air rows, u(g) (also running). */
function timingOnly(r: AnalysisResult): unknown {
  const swings = r.swings.map(({ temperature_C: _t, pressure_Pa: _p, humidity_pct: _h, ...rest }) => rest);
  return {
    ...r,
    environment: undefined,
    g_u_m_s2: undefined,
    swings,
    plots: { ...r.plots, room: undefined, gRunning: { ...r.plots.gRunning, g_u: undefined } },
    budget: r.budget.filter((b) => b.id !== 'air'),
    corrections: r.corrections.filter((c) => c.id !== 'air'),
  };
}

describe('room records in a run', () => {
  it('A and S lines between the others move no timing figure, are not unknown kinds, and size the air term', () => {
    const { entries } = simAndAnalyze(loadScenario('demo-low-q'), { seed: 4, durationS: 240 });
    const plain = renumber(entries, () => []);
    let n = 0;
    const withRoom = renumber(entries, (r, i) => {
      if (r.kind === 'H') return [{ kind: 'S', seq: 0, state: 0 }];
      if (r.kind !== 'T' || i % 10 !== 0) return [];
      n++;
      return [{ kind: 'A', seq: 0, ticks: r.ticks + 1000, temp: 2100 + (n % 7), press: 101325 - n, hum: 45000 + n }];
    });
    expect(n).toBeGreaterThan(20);
    const a = analyzeEntries(plain);
    const b = analyzeEntries(withRoom);
    expect(b.counts.unknown_kinds).toBe(0);
    expect(b.counts.lines_lost).toBe(0);
    expect(timingOnly(b)).toEqual(timingOnly(a));
    // The readings are in the rows, the plots and the environment, within the range sent.
    const env = b.environment!;
    expect(env.temperature_min_C).toBeGreaterThanOrEqual(21);
    expect(env.temperature_max_C).toBeLessThanOrEqual(21.06);
    const rowT = b.swings.map((s) => s.temperature_C).filter((t): t is number => typeof t === 'number');
    expect(rowT.length).toBeGreaterThan(b.swings.length / 2);
    for (const t of rowT) expect(t).toBeGreaterThanOrEqual(21), expect(t).toBeLessThanOrEqual(21.06);
    expect(b.plots.room!.t_s.length).toBeGreaterThan(20);
    expect(a.environment).toBeNull();
    // Air density: docs/references.md (CIPM-2007) gives 1.19931 kg/m³ at 20 °C, 101325 Pa, 50 %RH; carried to the
    // readings' mean by the ideal-gas law (T, p), with the 5 %RH difference worth under 0.1 % (derived): within 0.1 %.
    const scaled = 1.19931 * (293.15 / (273.15 + env.temperature_mean_C)) * (env.pressure_mean_Pa / 101325);
    expect(Math.abs(env.air_density_kg_m3 / scaled - 1)).toBeLessThan(1e-3);
    // Buoyancy and potential-flow added mass are linear in the air density; the Stokes layer's share goes as √ρ
    // (pendulum-corrections.ts): the air row follows the density's ratio to the rig's 1.2 kg/m³ (its default)
    // within a tenth of that ratio's distance from 1 (derived).
    const airA = a.corrections.find((c) => c.id === 'air')!;
    const airB = b.corrections.find((c) => c.id === 'air')!;
    const rhoRatio = env.air_density_kg_m3 / 1.2;
    expect(Math.abs(airB.period_rel! / airA.period_rel! - rhoRatio)).toBeLessThan(0.1 * Math.abs(1 - rhoRatio));
    // u(g) moves by the air row's change only (rows add in quadrature).
    const rowA = a.budget.find((r) => r.id === 'air')!.u_rel_g;
    const rowB = b.budget.find((r) => r.id === 'air')!.u_rel_g;
    const g = b.g_m_s2!;
    expect((b.g_u_m_s2! ** 2 - a.g_u_m_s2! ** 2) / (g ** 2 * (rowB ** 2 - rowA ** 2))).toBeCloseTo(1, 3);
  });
});
