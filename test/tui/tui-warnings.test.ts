// Warning rules: silence for three expected periods, missing heartbeats, a gate off centre, a clock-dominated budget.
import { describe, expect, it } from 'vitest';
import { clockShare, gateHint, warningsFor, type WarningInput } from '../../host/tui/warnings.ts';

const base: WarningInput = {
  now_s: 100,
  lastPass_s: 99,
  since_s: 0,
  expectedPeriod_s: 2,
  gateOffset_m: 0.0003,
  gateOffset_u_m: 0.0001,
  budget: [{ id: 'length' as const, name: 'length', u_rel_g: 1e-3 }],
  lastHeartbeat_s: 99.5,
  heartbeatInterval_s: 1,
  expectingLines: true,
  disconnected: false,
};
const reasons = (w: Partial<WarningInput>) => warningsFor({ ...base, ...w }).map((x) => x.reason);

describe('warnings', () => {
  it('nothing to say about a healthy run', () => {
    expect(reasons({})).toEqual([]);
  });

  it('no passes for more than three expected periods', () => {
    expect(reasons({ lastPass_s: 100 - 5.9 })).toEqual([]);
    expect(reasons({ lastPass_s: 100 - 6.1 })).toEqual(['no-passes']);
    // Before the first pass, silence counts from the first line.
    expect(reasons({ lastPass_s: null, since_s: 93 })).toEqual(['no-passes']);
    // A finished replay is not "silent".
    expect(reasons({ lastPass_s: 50, expectingLines: false })).toEqual([]);
  });

  it('says why the passes stopped when it can tell', () => {
    const text = (w: Partial<WarningInput>) => warningsFor({ ...base, lastPass_s: 80, ...w })[0]!.text;
    expect(text({})).toMatch(/^no passes for 20 s \(10 periods\): is it swinging through the beam\?$/);
    expect(text({ blocked: true })).toMatch(/beam stays blocked/);
    expect(text({ lastAmplitude_deg: 1.6, beamHalfAngle_deg: 1.43 })).toMatch(/died down to the beam width/);
    expect(text({ lastAmplitude_deg: 5, beamHalfAngle_deg: 1.43 })).toMatch(/is it swinging through the beam/);
  });

  it('heartbeats missing for more than three intervals', () => {
    expect(reasons({ lastHeartbeat_s: 97.1 })).toEqual([]);
    expect(reasons({ lastHeartbeat_s: 96.9 })).toEqual(['heartbeats-missing']);
    expect(reasons({ lastHeartbeat_s: 50, heartbeatInterval_s: 20 })).toEqual([]);
  });

  it('a gate more than 2 mm off centre, beyond its uncertainty', () => {
    expect(reasons({ gateOffset_m: 0.0025 })).toEqual(['gate-offset']);
    expect(reasons({ gateOffset_m: -0.0025 })).toEqual(['gate-offset']);
    expect(reasons({ gateOffset_m: 0.0025, gateOffset_u_m: 0.002 })).toEqual([]);
  });

  it('the clock dominating the g budget', () => {
    const budget = [
      { id: 'length' as const, name: 'length', u_rel_g: 1e-4 },
      { id: 'clock' as const, name: 'clock rate', u_rel_g: 2e-4 },
    ];
    expect(clockShare(budget)).toBeCloseTo(0.8, 12);
    expect(reasons({ budget })).toEqual(['clock-dominates']);
    expect(reasons({ budget: [{ id: 'clock' as const, name: 'clock rate', u_rel_g: 1e-5 }, { id: 'length' as const, name: 'length', u_rel_g: 1e-3 }] })).toEqual([]);
  });

  it('a disconnect is reported first and hides the silence rules', () => {
    expect(reasons({ disconnected: true, lastPass_s: 0, lastHeartbeat_s: 0 })).toEqual(['disconnected']);
  });
});

describe('gate hint', () => {
  // Sign convention of AnalysisResult.gate_offset_m: positive toward the release side.
  it('says which way to move, or that it is centred', () => {
    expect(gateHint(0.0012, 0.0001)).toBe('move 1.2 mm away from release side');
    expect(gateHint(-0.0012, 0.0001)).toBe('move 1.2 mm toward release side');
    expect(gateHint(0.0001, 0.0001)).toBe('centred');
    expect(gateHint(null, null)).toBe('not known yet');
  });
});
