// A reversible rig's flag_radius_u_m: the transit reads the flag width over its radius, so the radius's relative
// uncertainty joins the width's in the one flag-width term the analysis carries (protocol/rig.ts swingView).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { blockHalfAngle } from '../../host/analysis/transit-amplitude.ts';
import { parseRig, swingView } from '../../protocol/rig.ts';

const bar = { pendulum: 'reversible', pivot: 1, edge_distance_m: 1, edge_distance_u_m: 2e-5, cm_distance_m: 0.6, cm_distance_u_m: 0.001, flag_radius_m: 1.1, flag_width_m: 0.01, flag_width_u_m: 1e-4 };

describe('flag_radius_u_m', () => {
  it('a radius read long by a fraction e blocks the same angle as a flag narrower by that fraction (asin(w/2R))', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 0.05, noNaN: true }), fc.double({ min: 0.2, max: 3, noNaN: true }), fc.double({ min: -0.02, max: 0.02, noNaN: true }), (w, R, e) => {
        expect(blockHalfAngle(w, R * (1 + e))).toBeCloseTo(blockHalfAngle(w / (1 + e), R), 14);
      }),
    );
  });

  it('adds w·u_R/R to the flag width u in quadrature; absent, the width u is unchanged', () => {
    const r = parseRig({ ...bar, flag_radius_u_m: 0.011 });
    const r0 = parseRig(bar);
    if (!r.ok || !r0.ok) throw new Error('rig refused');
    // 11 mm on 1.1 m is 1 %: 0.1 mm on the 10 mm flag, beside its own 0.1 mm.
    expect(swingView(r.rig).flag_width_u_m).toBeCloseTo(Math.hypot(1e-4, 1e-4), 12);
    expect(swingView(r0.rig).flag_width_u_m).toBe(1e-4);
  });

  it('is refused beyond its range, with the key named', () => {
    const r = parseRig({ ...bar, flag_radius_u_m: 5 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toContain('flag_radius_u_m');
  });
});
