import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { NOMINAL_CLOCK_U_PPM } from '../../host/pipeline/clock-choice.ts';
import { TestRng } from '../analysis/seeded-rng.ts';
import { buildJournal, passEdges, type Edge } from './journal-builder.ts';

const H = 1.0032;
const mids = (n: number): number[] => Array.from({ length: n }, (_, k) => 2 + k * H);
const rng = new TestRng(21);
const usb = (): number => 1e-3 * Math.ceil(rng.uniform() * 1) + rng.exponential(150e-6);

describe('choice of the device clock correction', () => {
  it('a 1 PPS input on channel 1 is used by default, and gives the rate far better than the host', () => {
    const pps: Edge[] = Array.from({ length: 1200 }, (_, k) => ({ t: 1.5 + k, edge: 'r' as const, ch: 1 }));
    const b = buildJournal({ edges: [...passEdges(mids(1190), 0.04), ...pps].sort((x, y) => x.t - y.t), durationS: 1205, ppm: -1234.5, latencyS: usb });
    const r = analyzeEntries(b.entries);
    expect(r.clock_source).toBe('pps');
    expect(r.clock_ppm!).toBeCloseTo(-1234.5, 2);
    expect(r.clock_u_ppm!).toBeLessThan(0.01);
    const host = analyzeEntries(b.entries, { clock: 'host' });
    expect(host.clock_source).toBe('host');
    expect(Math.abs(host.clock_ppm! + 1234.5)).toBeLessThan(3 * host.clock_u_ppm! + 0.05);
    // Intervals are corrected: the half-periods come out at their true length.
    expect(r.swings[5]!.half_period_s!).toBeCloseTo(H, 7);
  });

  it('too short a run for the host calibration falls back to the nominal rate and says so; --clock host forces it', () => {
    const b = buildJournal({ edges: passEdges(mids(110), 0.04), durationS: 115, ppm: 300, latencyS: usb });
    const auto = analyzeEntries(b.entries);
    expect(auto.clock_source).toBe('nominal');
    expect(auto.clock_u_ppm).toBeCloseTo(NOMINAL_CLOCK_U_PPM, 6);
    expect(auto.warnings.map(warningText).some((w) => /too short .* host-clock calibration/.test(w))).toBe(true);
    const forced = analyzeEntries(b.entries, { clock: 'host' });
    expect(forced.clock_source).toBe('host');
    expect(Math.abs(forced.clock_ppm! - 300)).toBeLessThan(30);
    expect(forced.warnings.map(warningText).some((w) => /--clock host over only/.test(w))).toBe(true);
  });

  it('a given rate is applied as it is', () => {
    const b = buildJournal({ edges: passEdges(mids(60), 0.04), durationS: 65, ppm: 500 });
    const r = analyzeEntries(b.entries, { clock: 500 });
    expect(r.clock_source).toBe('given');
    expect(r.swings[5]!.half_period_s!).toBeCloseTo(H, 7);
    expect(r.swings[5]!.transit_s).toBeCloseTo(0.04, 7);
  });
});
