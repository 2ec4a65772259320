// The braille canvas: dot bits against the Unicode braille pattern layout, lines, clipping and tone runs.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { canvasRowRuns, cellChar, createCanvas, drawLine, setDot } from '../../host/tui/plot/braille-canvas.ts';

describe('braille canvas', () => {
  it('maps each of the 8 dots to its Unicode braille dot number', () => {
    // Unicode 15.0 §22.8 "Braille Patterns": U+2800 + bit (n−1) for dot n; dots 1-2-3 and 7 run down the
    // left column, 4-5-6 and 8 down the right column.
    const dotNumber = [
      [1, 4],
      [2, 5],
      [3, 6],
      [7, 8],
    ];
    for (let y = 0; y < 4; y++)
      for (let x = 0; x < 2; x++) {
        const c = createCanvas(1, 1);
        setDot(c, x, y, 0);
        expect(cellChar(c, 0, 0).codePointAt(0)).toBe(0x2800 + (1 << (dotNumber[y]![x]! - 1)));
      }
  });

  it('fills a whole cell to U+28FF and leaves an empty one at U+2800', () => {
    const c = createCanvas(2, 1);
    for (let y = 0; y < 4; y++) for (let x = 0; x < 2; x++) setDot(c, x, y, 0);
    expect(cellChar(c, 0, 0)).toBe('\u28ff');
    expect(cellChar(c, 1, 0)).toBe('\u2800');
  });

  it('ignores dots outside the canvas', () => {
    fc.assert(
      fc.property(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }), (x, y) => {
        const c = createCanvas(3, 2);
        setDot(c, x, y, 1);
        const inside = Math.round(x) >= 0 && Math.round(x) < 6 && Math.round(y) >= 0 && Math.round(y) < 8;
        expect(c.bits.some((b) => b !== 0)).toBe(inside);
      }),
    );
  });

  it('draws a line with no gaps: every dot column between the ends is touched', () => {
    const c = createCanvas(10, 3);
    drawLine(c, 0, 0, 19, 11, 0);
    for (let x = 0; x < 20; x++) {
      const col = Math.floor(x / 2);
      const bit = x % 2 === 0 ? 0x01 | 0x02 | 0x04 | 0x40 : 0x08 | 0x10 | 0x20 | 0x80;
      const any = [0, 1, 2].some((row) => (c.bits[row * 10 + col]! & bit) !== 0);
      expect(any).toBe(true);
    }
  });

  it('groups a row into runs of equal tone, the later tone winning a shared cell', () => {
    const c = createCanvas(4, 1);
    setDot(c, 0, 0, 0);
    setDot(c, 2, 0, 0);
    setDot(c, 3, 0, 1);
    const runs = canvasRowRuns(c, 0);
    expect(runs.map((r) => r.tone)).toEqual([0, 1, -1]);
    expect(runs.map((r) => r.text.length)).toEqual([1, 1, 2]);
  });
});
