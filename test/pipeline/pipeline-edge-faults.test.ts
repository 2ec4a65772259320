import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { buildJournal, passEdges, type Edge } from './journal-builder.ts';

// A beat of passes 1.0032 s apart (half of a 2.0064 s period) with a 40 ms transit; no physics needed here.
const H = 1.0032;
const TAU = 0.04;
const mids = (n: number, from = 2): number[] => Array.from({ length: n }, (_, k) => from + k * H);
const periodsOk = (r: ReturnType<typeof analyzeEntries>): boolean => r.swings.every((s) => s.period_s === null || Math.abs(s.period_s - 2 * H) < 1e-5);

describe('edges → passes: bounce, glitches, resync, bridging, objects', () => {
  it('a clean run: every pass valid, every period right', () => {
    const r = analyzeEntries(buildJournal({ edges: passEdges(mids(100), TAU), durationS: 110 }).entries, { clock: 'nominal' });
    expect(r.passes).toBe(100);
    expect(r.periods).toBe(98);
    expect(periodsOk(r)).toBe(true);
    expect(r.counts).toMatchObject({ rejected_passes: 0, bridged_gaps: 0, glitches: 0, bounces: 0, edge_resyncs: 0 });
  });

  it('chatter at both transitions merges into one pass timed by the first edge of each transition', () => {
    const e: Edge[] = [];
    for (const m of mids(60)) {
      const a = m - TAU / 2;
      const b = m + TAU / 2;
      e.push({ t: a, edge: 'f' }, { t: a + 30e-6, edge: 'r' }, { t: a + 90e-6, edge: 'f' });
      e.push({ t: b, edge: 'r' }, { t: b + 40e-6, edge: 'f' }, { t: b + 100e-6, edge: 'r' }, { t: b + 150e-6, edge: 'f' }, { t: b + 170e-6, edge: 'r' });
    }
    const r = analyzeEntries(buildJournal({ edges: e, durationS: 70 }).entries, { clock: 'nominal' });
    expect(r.passes).toBe(60);
    expect(r.counts.bounces).toBe(180);
    expect(r.counts.glitches).toBe(0);
    for (const s of r.swings) expect(s.transit_s).toBeCloseTo(TAU, 7);
    expect(periodsOk(r)).toBe(true);
  });

  it('an isolated short block is a glitch, not a pass', () => {
    const e = [...passEdges(mids(40), TAU), { t: 10.5, edge: 'f' as const }, { t: 10.5001, edge: 'r' as const }].sort((a, b) => a.t - b.t);
    const r = analyzeEntries(buildJournal({ edges: e, durationS: 45 }).entries, { clock: 'nominal' });
    expect(r.passes).toBe(40);
    expect(r.counts.glitches).toBe(1);
  });

  it('a lost unblocking edge (two falls in a row) resyncs: one pass lost and bridged, later passes unharmed', () => {
    const b = buildJournal({ edges: passEdges(mids(50), TAU), durationS: 55, drop: (_, rec) => rec.kind === 'E' && rec.edge === 'r' && Math.abs(rec.ticks / 16e6 - (2 + 20 * H + TAU / 2)) < 1e-6 });
    const r = analyzeEntries(b.entries, { clock: 'nominal' });
    expect(r.counts.lines_lost).toBe(1);
    expect(r.passes).toBe(49);
    expect(r.counts.bridged_gaps).toBe(1);
    expect(periodsOk(r)).toBe(true);
    expect(r.swings.some((s) => s.flags.includes('bridged:1'))).toBe(true);
  });

  it('two missing passes in a row are bridged too; a longer gap starts a new segment', () => {
    const m = mids(80).filter((_, k) => k !== 30 && k !== 31 && !(k >= 50 && k < 56));
    const r = analyzeEntries(buildJournal({ edges: passEdges(m, TAU), durationS: 85 }).entries, { clock: 'nominal' });
    expect(r.counts.bridged_gaps).toBe(1);
    expect(r.counts.long_gaps).toBe(1);
    expect(periodsOk(r)).toBe(true);
  });

  it('an object through the beam between passes is rejected and said so; one merged with a pass rejects that pass', () => {
    const e = [...passEdges(mids(60), TAU), { t: 20.3, edge: 'f' as const }, { t: 20.5, edge: 'r' as const }];
    // An object that overlaps pass 40's transit: one long block.
    const p40 = 2 + 40 * H;
    const merged = e.filter((x) => Math.abs(x.t - p40) > 0.1).concat([{ t: p40 - TAU / 2, edge: 'f' }, { t: p40 + 0.25, edge: 'r' }]);
    const r = analyzeEntries(buildJournal({ edges: merged.sort((a, b) => a.t - b.t), durationS: 65 }).entries, { clock: 'nominal' });
    expect(r.counts.rejected_passes).toBe(2);
    expect(r.counts.bridged_gaps).toBe(1);
    expect(r.warnings.map(warningText).some((w) => /object through the beam/.test(w))).toBe(true);
    expect(periodsOk(r)).toBe(true);
  });

  it('a CRC error is counted as such, not also as a lost line', () => {
    const b = buildJournal({ edges: passEdges(mids(30), TAU), durationS: 35, mangle: (i, l) => (i === 25 ? l.replace(/\*..$/, l.endsWith('*00') ? '*01' : '*00') : l) });
    const r = analyzeEntries(b.entries, { clock: 'nominal' });
    expect(r.counts.crc_errors).toBe(1);
    expect(r.line_rejections).toEqual({ 'bad-crc': 1 });
    expect(r.counts.lines_lost).toBe(0);
  });

  it('48-bit ticks wrap inside a run without a break', () => {
    const b = buildJournal({ edges: passEdges(mids(40), TAU), durationS: 45, tickOffset: 2 ** 48 - 20 * 16e6 });
    const r = analyzeEntries(b.entries, { clock: 'nominal' });
    expect(r.passes).toBe(40);
    expect(r.counts.reboots).toBe(0);
    expect(periodsOk(r)).toBe(true);
  });

  it('a reboot starts a new timebase, joined on the host clock; no period spans it', () => {
    const b = buildJournal({ edges: passEdges(mids(80), TAU), durationS: 85, reboots: [40.3] });
    const r = analyzeEntries(b.entries, { clock: 'nominal' });
    expect(r.counts.reboots).toBe(1);
    expect(periodsOk(r)).toBe(true);
    // Pass times stay on one host timeline (within the 0.5 ms latency of the join).
    for (const s of r.swings) expect(Math.abs(((s.t_s - 2 + 1e-9) / H) % 1) < 1e-3 || Math.abs(((s.t_s - 2) / H) % 1) > 1 - 1e-3).toBe(true);
  });

  it('without a usable rig: periods and T0 still, no amplitudes or g, and warnings say why', () => {
    const b = buildJournal({ edges: passEdges(mids(60), TAU), durationS: 65, rigJson: '{"lenght_m":1,"flag_width_m":0.02}' });
    const r = analyzeEntries(b.entries, { clock: 'nominal' });
    expect(r.T0_s!).toBeCloseTo(2 * H, 6);
    expect(r.g_m_s2).toBeNull();
    expect(r.amplitude_start_deg).toBeNull();
    expect(r.warnings.map(warningText).some((w) => /#rig line is not usable \(unknown rig key "lenght_m"/.test(w))).toBe(true);
    expect(r.warnings.map(warningText).some((w) => /no rig description/.test(w))).toBe(true);
  });

  it('a journal with too few passes gives a total result: nulls and warnings, no exception', () => {
    const r = analyzeEntries(buildJournal({ edges: passEdges(mids(2), TAU), durationS: 5 }).entries);
    expect(r.T0_s).toBeNull();
    expect(r.B).toBeNull();
    expect(r.warnings.length).toBeGreaterThan(0);
    expect(analyzeEntries([]).passes).toBe(0);
  });
});
