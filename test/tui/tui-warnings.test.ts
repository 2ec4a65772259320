// Live warning rules: silence for three expected periods, missing heartbeats, a lost link, then the analysis' own
// warnings (typed, in the words of host/output/warning-words.ts), never a second set of rules.
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { warningsFor, type WarningInput } from '../../host/tui/warnings.ts';
import { warningText } from '../../host/output/warning-words.ts';
import type { Warning } from '../../host/analysis/warning.ts';

const base: WarningInput = {
  now_s: 100,
  lastPass_s: 99,
  since_s: 0,
  expectedPeriod_s: 2,
  lastHeartbeat_s: 99.5,
  heartbeatInterval_s: 1,
  expectingLines: true,
  disconnected: false,
  analysis: [],
};
const kinds = (w: Partial<WarningInput>) => warningsFor({ ...base, ...w }).map((x) => x.kind);

describe('live warnings', () => {
  it('nothing to say about a healthy run', () => {
    expect(kinds({})).toEqual([]);
  });

  it('no passes for more than three expected periods', () => {
    expect(kinds({ lastPass_s: 100 - 5.9 })).toEqual([]);
    expect(kinds({ lastPass_s: 100 - 6.1 })).toEqual(['no-passes']);
    // Before the first pass, silence counts from the first line.
    expect(kinds({ lastPass_s: null, since_s: 93 })).toEqual(['no-passes']);
    // A finished replay is not "silent".
    expect(kinds({ lastPass_s: 50, expectingLines: false })).toEqual([]);
  });

  it('says why the passes stopped when it can tell', () => {
    const text = (w: Partial<WarningInput>) => warningsFor({ ...base, lastPass_s: 80, ...w })[0]!.text;
    expect(text({})).toMatch(/^no passes for 20 s \(10 periods\): is it swinging through the beam\?$/);
    expect(text({ blocked: true })).toMatch(/beam stays blocked/);
    expect(text({ lastAmplitude_deg: 1.6, beamHalfAngle_deg: 1.43 })).toMatch(/died down to the beam width/);
    expect(text({ lastAmplitude_deg: 5, beamHalfAngle_deg: 1.43 })).toMatch(/is it swinging through the beam/);
  });

  it('a bob still swinging inside the flag is said to swing, not to rest (#14 item 5)', () => {
    // 0.6 m, 30 mm flag: the beam half-angle is asin(0.015/0.6) = 1.43°; the last amplitude 1.43° is ±15 mm.
    const t = warningsFor({ ...base, lastPass_s: 80, blocked: true, lastAmplitude_deg: 1.4325, beamHalfAngle_deg: 1.4325, length_m: 0.6, flagWidth_m: 0.03 })[0]!.text;
    expect(t).toContain('the bob swings inside the 30 mm flag (at most ±15 mm, its last measured swing)');
    expect(t).not.toMatch(/resting/);
    // The same when the beam is open between the swing's one-sided passes (the newest pass left out).
    const open = warningsFor({ ...base, lastPass_s: 80, blocked: false, lastAmplitude_deg: 1.4325, beamHalfAngle_deg: 1.4325, length_m: 0.6, flagWidth_m: 0.03 })[0]!.text;
    expect(open).toBe(t);
  });

  it('room readings missing for more than three of their intervals, while the board still talks', () => {
    // Readings every 10 s (the spacing of the last two): 30 s is three intervals, the heartbeats' rule.
    expect(kinds({ room: { lastReading_s: 70.5, spacing_s: 10 } })).toEqual([]);
    expect(kinds({ room: { lastReading_s: 69.5, spacing_s: 10 } })).toEqual(['room-reading-stale']);
    // One reading so far: the board's default interval (10 s, protocol/link-defaults.ts) stands in for the spacing.
    expect(kinds({ room: { lastReading_s: 69.5, spacing_s: null } })).toEqual(['room-reading-stale']);
    // A board set to read every 60 s is not late after 40 s.
    expect(kinds({ room: { lastReading_s: 60, spacing_s: 60 } })).toEqual([]);
    // A finished recording says nothing about the room; a silent board is said once, by its heartbeats.
    expect(kinds({ room: { lastReading_s: 0, spacing_s: 10 }, expectingLines: false })).toEqual([]);
    expect(kinds({ room: { lastReading_s: 0, spacing_s: 10 }, lastHeartbeat_s: 90 })).toEqual(['heartbeats-missing']);
    const t = warningsFor({ ...base, room: { lastReading_s: 55, spacing_s: 10 } })[0]!.text;
    expect(t).toBe("last room reading 45 s ago, the board reads every 10 s: check the sensor's wiring (hardware-notes/room-sensor.md); timing goes on");
  });

  it('heartbeats missing for more than three intervals', () => {
    expect(kinds({ lastHeartbeat_s: 97.1 })).toEqual([]);
    expect(kinds({ lastHeartbeat_s: 96.9 })).toEqual(['heartbeats-missing']);
    expect(kinds({ lastHeartbeat_s: 50, heartbeatInterval_s: 20 })).toEqual([]);
  });

  it('a disconnect is reported first and hides the silence rules', () => {
    expect(kinds({ disconnected: true, lastPass_s: 0, lastHeartbeat_s: 0 })).toEqual(['disconnected']);
  });

  it('the analysis\' warnings follow the live ones, in the same words as analyze prints', () => {
    const analysis: Warning[] = [{ kind: 'clock-nominal', u_ppm: 2886.75 }, { kind: 'gate-offset', offset_m: 0.0025, u_m: 0.0001, side: 'release' }];
    const w = warningsFor({ ...base, lastPass_s: 80, analysis });
    expect(w.map((x) => x.kind)).toEqual(['no-passes', 'clock-nominal', 'gate-offset']);
    expect(w.slice(1).map((x) => x.text)).toEqual(analysis.map(warningText));
  });

  it('keeps no rules of its own: no threshold, no regex over budget names', () => {
    const src = readFileSync(fileURLToPath(new URL('../../host/tui/warnings.ts', import.meta.url)), 'utf8');
    expect(src).not.toMatch(/budget|clock|gate|0\.5\b|RegExp|\/i\b/);
  });
});
