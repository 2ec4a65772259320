// The top view's drawing: where the dots of a path fall, decoded back from the braille cells (exact geometry of the ellipse).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { renderTopView, type TopViewSpec } from '../../host/tui/plot/top-view.ts';

/** Bits of the braille dots by [row][column] (Unicode's braille pattern block). */
const BITS = [
  [0x01, 0x08],
  [0x02, 0x10],
  [0x04, 0x20],
  [0x40, 0x80],
];

/** The dots drawn in `tone`, as [x, y] in dot units (y down), decoded from the rendered lines. */
function dotsOf(spec: TopViewSpec, tone: string): [number, number][] {
  const out: [number, number][] = [];
  renderTopView(spec).forEach((line, row) => {
    let col = 0;
    for (const run of line) {
      for (const ch of run.text) {
        const bits = ch.codePointAt(0)! - 0x2800;
        if (run.tone === tone && bits > 0) BITS.forEach((r, dy) => r.forEach((b, dx) => bits & b && out.push([col * 2 + dx, row * 4 + dy])));
        col++;
      }
    }
  });
  return out;
}

const base = { cols: 10, rows: 4, halfSpan_m: 0.2, beamLines_rad: [] };
/** Dot centre and dots per metre of a 10×4 box showing ±0.2 m: 20×16 dots, the shorter side sets the scale. */
const [cx, cy, perM] = [9.5, 7.5, 7.5 / 0.2];

describe('top view', () => {
  it('is exactly rows × cols characters, blank without paths', () => {
    const lines = renderTopView({ ...base, paths: [] });
    expect(lines).toHaveLength(4);
    for (const l of lines) {
      expect([...l.map((r) => r.text).join('')]).toHaveLength(10);
      expect(l.every((r) => r.tone === 'blank')).toBe(true);
    }
  });

  it('a plane swing along the reference direction is a horizontal line of ±a through the centre', () => {
    const d = dotsOf({ ...base, paths: [{ azimuth_rad: 0, a_m: 0.16, b_m: 0 }] }, 'points');
    const xs = d.map(([x]) => x);
    // a = 0.16 m at 37.5 dots/m: 6 dots either side of the centre column 9.5.
    expect(Math.min(...xs)).toBe(Math.round(cx - 0.16 * perM));
    expect(Math.max(...xs)).toBe(Math.round(cx + 0.16 * perM));
    for (const [, y] of d) expect(Math.abs(y - cy)).toBeLessThanOrEqual(0.5);
  });

  it('an axis at +90° (counterclockwise of the reference) is vertical; a circle (b = a) reaches ±a both ways', () => {
    const v = dotsOf({ ...base, paths: [{ azimuth_rad: Math.PI / 2, a_m: 0.16, b_m: 0 }] }, 'points');
    for (const [x] of v) expect(Math.abs(x - cx)).toBeLessThanOrEqual(0.5);
    expect(Math.max(...v.map(([, y]) => Math.abs(y - cy)))).toBeCloseTo(6.5, 0);
    const c = dotsOf({ ...base, paths: [{ azimuth_rad: 0.3, a_m: 0.15, b_m: -0.15 }] }, 'points');
    for (const [x, y] of c) expect(Math.hypot(x - cx, y - cy) / (0.15 * perM)).toBeGreaterThan(0.85);
  });

  it('every dot of a path lies on its ellipse, to the rounding of a dot, and the dots reach both ends of the major axis', () => {
    fc.assert(
      fc.property(fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }), fc.double({ min: 0.05, max: 0.2, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), (psi, a, ratio) => {
        const b = a * ratio;
        // The ellipse, independently: x = a cos ψ cos u − b sin ψ sin u, y = a sin ψ cos u + b cos ψ sin u, finely sampled.
        const curve = Array.from({ length: 2000 }, (_, k) => {
          const u = (2 * Math.PI * k) / 2000;
          return [a * Math.cos(psi) * Math.cos(u) - b * Math.sin(psi) * Math.sin(u), a * Math.sin(psi) * Math.cos(u) + b * Math.cos(psi) * Math.sin(u)] as const;
        });
        const d = dotsOf({ ...base, paths: [{ azimuth_rad: psi, a_m: a, b_m: b }] }, 'points');
        // A dot is rounded to the nearest: at most √2/2 dot from the curve (plus the sampling's 2πa/2000).
        const slack = Math.SQRT1_2 / perM + (2 * Math.PI * a) / 2000;
        for (const [x, y] of d) {
          const [X, Y] = [(x - cx) / perM, (cy - y) / perM];
          expect(Math.min(...curve.map(([ex, ey]) => Math.hypot(X - ex, Y - ey)))).toBeLessThanOrEqual(slack);
        }
        for (const end of [1, -1]) expect(Math.min(...d.map(([x, y]) => Math.hypot((x - cx) / perM - end * a * Math.cos(psi), (cy - y) / perM - end * a * Math.sin(psi))))).toBeLessThanOrEqual(slack);
      }),
      { numRuns: 40 },
    );
  });

  it('the newest path in its own tone over the older ones, beam lines dotted beneath', () => {
    // A cell takes the tone drawn last in it: the newest (horizontal) path's cells are the middle rows, the older
    // (vertical) path keeps its tone in the middle columns above and below, the beams' diagonals show in the corners.
    const spec: TopViewSpec = { ...base, beamLines_rad: [Math.PI / 4, -Math.PI / 4], paths: [{ azimuth_rad: Math.PI / 2, a_m: 0.16, b_m: 0 }, { azimuth_rad: 0, a_m: 0.16, b_m: 0 }] };
    expect(dotsOf(spec, 'points').every(([, y]) => y >= 4 && y < 12)).toBe(true);
    const older = dotsOf(spec, 'fit');
    expect(older.some(([, y]) => y < 4) && older.some(([, y]) => y >= 12)).toBe(true);
    for (const [x] of older) expect(Math.abs(x - cx)).toBeLessThan(2);
    const beams = dotsOf(spec, 'axis');
    expect(beams.length).toBeGreaterThan(4);
    // Every third dot along the diagonals through the centre.
    for (const [x, y] of beams) expect(Math.abs(Math.abs(x - cx) - Math.abs(y - cy))).toBeLessThanOrEqual(1);
    const plain = dotsOf({ ...spec, beamLines_rad: [] }, 'axis');
    expect(plain).toHaveLength(0);
  });
});
