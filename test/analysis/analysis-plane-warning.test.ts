// The one-beam warning: how far the plane could turn, and the bias it would put on the amplitude.
import { describe, expect, it } from 'vitest';
import { oneBeamPlaneRisk } from '../../host/analysis/plane-warning.ts';
import { warningText } from '../../host/output/warning-words.ts';

describe('one-beam plane warning', () => {
  it('stays quiet on a short run and warns on a long one with the Earth\'s turn and the cos ψ bias (docs/references.md#ref-swing-plane)', () => {
    // 50° N: 11.52 °/h; 20 min → 3.8°, 0.2 % low: no warning. 2 h → 23.0°, 8.0 % low.
    expect(oneBeamPlaneRisk(1200, 50)).toBeNull();
    const r = oneBeamPlaneRisk(7200, 50)!;
    expect(r.turn_deg).toBeCloseTo(23.045, 2);
    expect(r.amplitude_low).toBeCloseTo(1 - Math.cos((23.045 * Math.PI) / 180), 4);
    const text = warningText({ kind: 'one-beam-plane', ...r });
    expect(text).toContain('8.0 % low');
    expect(text).toContain('beams');
    expect(text).not.toContain('\n');
  });

  it('assumes the worst latitude when the rig gives none, and says so', () => {
    const r = oneBeamPlaneRisk(3600)!;
    expect(r.turn_deg).toBeCloseTo(15.041, 3);
    expect(warningText({ kind: 'one-beam-plane', ...r })).toContain('no latitude_deg');
    // On the equator the Earth does not turn the plane.
    expect(oneBeamPlaneRisk(36000, 0)).toBeNull();
  });
});
