import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { gateOffset, offsetFromAlternation, timeFromBottom } from '../../host/analysis/gate-offset.ts';
import { blockHalfAngle } from '../../host/analysis/transit-amplitude.ts';

const DEG = Math.PI / 180;
const W0 = Math.sqrt(9.80665);

describe('gate offset from the alternation of half-periods', () => {
  it('docs/references.md#ref-gate-offset (ODE): L = 1 m, θ0 = 5°, δ = 0.5 mrad gives 1.00734278 s and 1.00002191 s', () => {
    // A thin beam (w → 0): the two half-periods' difference alone gives the offset.
    expect(offsetFromAlternation(1.00734278 - 1.00002191, 5 * DEG, W0, 1e-9, 1)).toBeCloseTo(0.0005, 8);
  });

  it('recovers x0 for a wide flag where the simple 4δ/Ω form is biased (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.003, max: 0.003, noNaN: true }), fc.double({ min: 2, max: 60, noNaN: true }), (x0, deg) => {
        const th = deg * DEG;
        const w = 0.0254;
        const ep = Math.asin((x0 + w / 2) / 1);
        const em = Math.asin((x0 - w / 2) / 1);
        const m = 0.5 * (timeFromBottom(ep, th, W0) + timeFromBottom(em, th, W0));
        expect(offsetFromAlternation(4 * m, th, W0, w, 1)).toBeCloseTo(x0, 10);
      }),
    );
  });

  it('sign: positive toward the side the bob was on before the first pass', () => {
    // Bob starts at +θ0; the beam leans to +x0. Pass 0 (moving −), the swing on the − side (long), pass 1, the + side (short).
    const th = 8 * DEG;
    const x0 = 0.001;
    const w = 0.02;
    const phiB = blockHalfAngle(w, 1);
    const T = 2.0064;
    const ep = Math.asin(x0 + w / 2);
    const em = Math.asin(x0 - w / 2);
    const m = 0.5 * (timeFromBottom(ep, th, W0) + timeFromBottom(em, th, W0));
    const t: number[] = [];
    for (let k = 0; k < 40; k++) t.push((k * T) / 2 + (k % 2 === 0 ? -m : m));
    const r = gateOffset({ index: t.map((_, k) => k), segment: t.map(() => 0), t, amplitude: t.map(() => th) }, W0, w, 1);
    expect(phiB).toBeGreaterThan(0);
    expect(r!.offset_m).toBeCloseTo(x0, 9);
  });
});
