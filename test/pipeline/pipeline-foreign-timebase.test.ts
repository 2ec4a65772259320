// A device whose ticks run faster than the host's seconds (the simulator on a pty at --speed 5, as `live` records
// it): #14 found negative times in the CSV of such a journal. Times must start at the first line, on the device's clock.
import { warningText } from '../../host/output/warning-words.ts';
import { describe, expect, it } from 'vitest';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

/** The journal a recorder writes when the simulated device runs `speed` times real time: host times shrink by `speed`. */
function atSpeed(entries: readonly JournalEntry[], speed: number): JournalEntry[] {
  return entries.map((e) => ('hostUs' in e && typeof e.hostUs === 'number' ? { ...e, hostUs: Math.round(e.hostUs / speed) } : e));
}

describe('a device clock running 5 times the host clock', () => {
  const { lines, truth } = simulateJournal(loadScenario('demo-low-q'), { seed: 3, durationS: 600 });
  const realTime = [...lines].map(parseJournalLine);
  const entries = atSpeed(realTime, 5);
  const firstLine_s = Math.min(...entries.flatMap((e) => (e.kind === 'data' ? [e.hostUs / 1e6] : [])));
  const r = analyzeEntries(entries);

  it('keeps every pass time at or after the first line, increasing', () => {
    expect(r.swings.length).toBeGreaterThan(300);
    expect(r.swings[0]!.t_s).toBeGreaterThanOrEqual(firstLine_s);
    for (let i = 1; i < r.swings.length; i++) expect(r.swings[i]!.t_s).toBeGreaterThan(r.swings[i - 1]!.t_s);
    // On the device clock: the swing clears the beam for about 290 simulated seconds, 58 host seconds of the recording.
    expect(r.swings.at(-1)!.t_s - r.swings[0]!.t_s).toBeGreaterThan(250);
  });

  it('says what happened and measures on the device clock (the simulator’s truth), not a 4 000 000 ppm host fit', () => {
    expect(r.warnings.map(warningText).some((w) => /clock ran 5\.00 times as fast as the host's/.test(w))).toBe(true);
    expect(r.clock_source).toBe('nominal');
    // The device model's own ppm is inside the nominal clock's uncertainty; T0 within 0.3 % (the scenario's clock error is smaller).
    expect(Math.abs(r.T0_s! / truth.physics.T0_s - 1)).toBeLessThan(3e-3);
  });

  it('a recording shorter than the host calibration needs (as reproduced: 35 s at 5×) starts at its first line too', () => {
    const short = atSpeed([...simulateJournal(loadScenario('demo-low-q'), { seed: 4, durationS: 175 }).lines].map(parseJournalLine), 5);
    const first = Math.min(...short.flatMap((e) => (e.kind === 'data' ? [e.hostUs / 1e6] : [])));
    const rs = analyzeEntries(short);
    expect(rs.swings[0]!.t_s).toBeGreaterThanOrEqual(first);
    expect(rs.swings.at(-1)!.t_s).toBeGreaterThan(150);
  });

  it('a real-time recording of the same run is still joined on the host clock', () => {
    const same = analyzeEntries(realTime);
    expect(same.warnings.map(warningText).some((w) => /times as fast/.test(w))).toBe(false);
    expect(same.clock_source).toBe('host');
  });
});
