// The gate offset's side is stated only when the run shows it (#14 item 2, #16): a recorded release, never a
// recording that joined mid-swing. Truth: the simulator's gate offset, + toward the release side (sim/scenario.ts).
import { describe, expect, it } from 'vitest';
import { gateSideOf } from '../../host/analysis/gate-side.ts';
import type { SequencedPasses } from '../../host/analysis/passes.ts';
import { gateFigure } from '../../host/output/gate-words.ts';
import { warningText } from '../../host/output/warning-words.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const passes = (td: number[], index = td.map((_, i) => i)): SequencedPasses =>
  ({ t: td, td, transit: td.map(() => 0.02), index, segment: td.map(() => 0), status: td.map(() => 0), bridgedBefore: td.map(() => false) }) as unknown as SequencedPasses;

describe('gate side: a recorded release or nothing', () => {
  it('a quiet longer than the first half-period (with 5 % to spare) proves the release', () => {
    const p = passes([1, 2, 3, 4]);
    expect(gateSideOf(1.2, p)).toBe('release');
    expect(gateSideOf(1.04, p)).toBeNull();
    expect(gateSideOf(0.3, p)).toBeNull();
    expect(gateSideOf(null, p)).toBeNull();
    // A pass left out before the first valid one flips the side: not known.
    expect(gateSideOf(5, passes([1, 2, 3, 4], [-1, 0, 1, 2]))).toBeNull();
  });

  /** demo-low-q (T0 1.55 s) with the gate offset by `mm` and a device reset at `resetS` while it swings. */
  function run(mm: number, resetS: number, releaseAtS = 3) {
    const base = loadScenario('demo-low-q');
    const s = { ...base, physics: { ...base.physics, release_at_s: releaseAtS }, faults: { reboot: { at_s: [resetS] } } };
    return [...simulateJournal(s, { seed: 3, durationS: 150, gate_offset_m: mm / 1000 }).lines];
  }

  /** The journal as a recorder that opened the port at the reset would have written it: header, then from the new hello. */
  function joinedAtReset(lines: string[]): string[] {
    const hellos = lines.map((l, i) => (/^\d+ H /.test(l) ? i : -1)).filter((i) => i >= 0);
    expect(hellos.length).toBe(2);
    return [...lines.filter((l) => l.startsWith('#') && !l.startsWith('#@')), ...lines.slice(hellos[1]!)];
  }

  it('a recording that joins mid-swing never states a side, for either sign of the offset (sim, 10 join times)', () => {
    for (const mm of [1.5, -1.5])
      for (let k = 0; k < 10; k++) {
        const r = analyzeEntries(joinedAtReset(run(mm, 40 + 0.17 * k)).map(parseJournalLine));
        expect(r.gate_offset_m, `${mm} mm, join ${k}`).not.toBeNull();
        // The size is still right (the truth: 1.5 mm; issue 5's bound 0.2 mm).
        expect(Math.abs(Math.abs(r.gate_offset_m!) * 1000 - 1.5)).toBeLessThan(0.2);
        expect(r.gate_offset_side).toBeNull();
        const figure = gateFigure(r.gate_offset_m, r.gate_offset_u_m, r.gate_offset_side);
        expect(figure).toContain('side not known');
        expect(figure).not.toMatch(/toward|away/);
        expect(r.warnings.map(warningText).join('\n')).not.toMatch(/release side/);
      }
  });

  it('a recorded release states the side, with the sign of the truth', () => {
    for (const mm of [1.5, -1.5]) {
      const r = analyzeEntries(run(mm, 1e9).map(parseJournalLine));
      expect(r.gate_offset_side).toBe('release');
      expect(Math.sign(r.gate_offset_m!)).toBe(Math.sign(mm));
      expect(Math.abs(r.gate_offset_m! * 1000 - mm)).toBeLessThan(0.2);
      expect(gateFigure(r.gate_offset_m, r.gate_offset_u_m, r.gate_offset_side)).toContain('+ toward the release side');
    }
  });
});
