// Safety and method notes, each shown only when the run makes it relevant (large angles, heavy bob, off-centre gate…).
import { gateAdvice } from '../output/gate-words.ts';
import type { AnalysisResult } from '../analysis/result.ts';
import type { Rig } from '../../protocol/rig.ts';
import { esc } from './escape.ts';
import { fixed, sig } from './format.ts';
import type { PeriodLaw } from './plots/period-plot.ts';

const DEG = Math.PI / 180;

// Thresholds below are common practice, no source: a textbook small-angle limit is about 4° to 5°; from
// roughly 20° the period is more than 0.75 % long, which no school measurement can ignore; a 1 kg bob at
// several m/s hurts; a gate more than 1 mm off the lowest point is easy to fix by moving it.
const LARGE_ANGLE_DEG = 20;
const FAST_ANGLE_DEG = 45;
const HEAVY_BOB_KG = 1;
const OFFSET_M = 1e-3;

interface Note {
  readonly kind: 'safety' | 'method';
  readonly text: string;
}

/** The notes that apply to this run (pure: from the result, the rig and the period law). */
function notesFor(r: AnalysisResult, rig: Rig | null, law: PeriodLaw): Note[] {
  const notes: Note[] = [];
  const a = r.amplitude_start_deg;
  if (a !== null && a >= LARGE_ANGLE_DEG) {
    const longer = (law(a * DEG) - 1) * 100;
    notes.push({
      kind: 'method',
      text: `Large amplitude: at ${fixed(a, 1)}° the period is ${sig(longer, 2)} % longer than the small-angle period. Every period here is reduced to zero amplitude with the exact law, so T0 and g do not carry this bias; the B, C fit shows how far the rig follows it.`,
    });
  }
  if (a !== null && a >= FAST_ANGLE_DEG && rig) {
    const v = Math.sqrt(2 * 9.81 * rig.length_m * (1 - Math.cos(a * DEG)));
    notes.push({
      kind: 'safety',
      text: `Release at ${fixed(a, 0)}°: the bob passes the gate at about ${sig(v, 2)} m/s. Keep hands, faces and equipment out of the swing plane, check the clamp and the string before every run, and follow your local lab rules and qualified supervision.`,
    });
  }
  if (rig?.bob_mass_kg !== undefined && rig.bob_mass_kg >= HEAVY_BOB_KG) {
    notes.push({
      kind: 'safety',
      text: `Heavy bob (${sig(rig.bob_mass_kg, 3)} kg): use a suspension rated well above its weight, keep the floor under it clear, and stop it by hand only at small amplitude. Follow your local lab rules and qualified supervision.`,
    });
  }
  if (r.gate_offset_m !== null && Math.abs(r.gate_offset_m) > OFFSET_M) {
    notes.push({
      kind: 'method',
      text: `The beam sits ${sig(Math.abs(r.gate_offset_m) * 1000, 2)} mm ${r.gate_offset_side === 'release' ? `${r.gate_offset_m > 0 ? 'toward' : 'away from'} the release side of` : 'from'} the lowest point. Full periods cancel this to first order, but half-periods and amplitudes do not: ${gateAdvice(r.gate_offset_m, r.gate_offset_u_m, r.gate_offset_side)}.`,
    });
  }
  if (r.clock_source === 'nominal') {
    notes.push({
      kind: 'method',
      text: 'The device clock was taken at its nominal rate. A ceramic resonator can be off by thousands of ppm, and g moves by twice the rate error: a longer run lets the heartbeats calibrate it.',
    });
  }
  return notes;
}

/** The notes as a section, or nothing when none applies. */
export function notesSection(r: AnalysisResult, rig: Rig | null, law: PeriodLaw): string {
  const notes = notesFor(r, rig, law);
  if (notes.length === 0) return '';
  const li = notes.map((n) => `<li class="note-${n.kind}"><span class="tag">${n.kind}</span> ${esc(n.text)}</li>`).join('');
  return `<section id="notes"><h2>Notes</h2><ul class="notes">${li}</ul></section>`;
}
