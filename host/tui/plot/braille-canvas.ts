// A pure braille dot canvas: each terminal cell holds a 2×4 grid of dots, and each cell remembers the tone last drawn in it.

/** Bits of the eight dots of one braille cell (Unicode U+2800 block), indexed [row][column]. */
const DOT_BITS: readonly (readonly [number, number])[] = [
  [0x01, 0x08],
  [0x02, 0x10],
  [0x04, 0x20],
  [0x40, 0x80],
];
const BRAILLE_BASE = 0x2800;

/** A grid of `cols × rows` cells, i.e. `2·cols × 4·rows` dots; dot (0, 0) is the top left. */
export interface BrailleCanvas {
  readonly cols: number;
  readonly rows: number;
  readonly bits: Uint8Array;
  /** Tone index per cell (−1: nothing drawn). */
  readonly tones: Int16Array;
}

/** An empty canvas. */
export function createCanvas(cols: number, rows: number): BrailleCanvas {
  const c = Math.max(0, Math.floor(cols));
  const r = Math.max(0, Math.floor(rows));
  return { cols: c, rows: r, bits: new Uint8Array(c * r), tones: new Int16Array(c * r).fill(-1) };
}

/** Sets the dot at (x, y) in dot units; dots outside the canvas are ignored. */
export function setDot(canvas: BrailleCanvas, x: number, y: number, tone: number): void {
  const xi = Math.round(x);
  const yi = Math.round(y);
  if (!(xi >= 0 && yi >= 0 && xi < canvas.cols * 2 && yi < canvas.rows * 4)) return;
  const cell = Math.floor(yi / 4) * canvas.cols + Math.floor(xi / 2);
  canvas.bits[cell] = canvas.bits[cell]! | DOT_BITS[yi % 4]![xi % 2]!;
  canvas.tones[cell] = tone;
}

/** Draws a straight line of dots between two points in dot units (clipped to the canvas). */
export function drawLine(canvas: BrailleCanvas, x0: number, y0: number, x1: number, y1: number, tone: number): void {
  const steps = Math.ceil(Math.max(Math.abs(x1 - x0), Math.abs(y1 - y0)));
  if (!Number.isFinite(steps)) return;
  if (steps === 0) {
    setDot(canvas, x0, y0, tone);
    return;
  }
  for (let i = 0; i <= steps; i++) setDot(canvas, x0 + ((x1 - x0) * i) / steps, y0 + ((y1 - y0) * i) / steps, tone);
}

/** The braille character of one cell. */
export function cellChar(canvas: BrailleCanvas, col: number, row: number): string {
  return String.fromCodePoint(BRAILLE_BASE + canvas.bits[row * canvas.cols + col]!);
}

/** One row of the canvas as runs of equal tone (−1 for empty cells), so a view can colour each run. */
export function canvasRowRuns(canvas: BrailleCanvas, row: number): { text: string; tone: number }[] {
  const runs: { text: string; tone: number }[] = [];
  for (let col = 0; col < canvas.cols; col++) {
    const tone = canvas.tones[row * canvas.cols + col]!;
    const ch = cellChar(canvas, col, row);
    const last = runs[runs.length - 1];
    if (last && last.tone === tone) last.text += ch;
    else runs.push({ text: ch, tone });
  }
  return runs;
}
