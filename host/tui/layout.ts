// Screen geometry for the live view: how 80×24 (or more) is shared between status, numbers, plots and footer.

export interface Layout {
  readonly width: number;
  readonly height: number;
  /** Width of the numbers column (left); the plots take the rest. */
  readonly numbersWidth: number;
  readonly plotWidth: number;
  /** Lines between the status lines and the bottom lines: the numbers column and the charts. */
  readonly bodyHeight: number;
  /** Lines of the first of the two stacked charts (the second takes the rest of the body). */
  readonly chartHeight: number;
  readonly statusLines: number;
}

export const MIN_WIDTH = 80;
export const MIN_HEIGHT = 24;
/** Lines outside the body: status, health, warning, footer (status takes two). */
const CHROME_LINES = 5;

/**
 * Divides the terminal; never smaller than 80×24 so the frame never outgrows a standard terminal's layout.
 * `extraLines`: full-width lines shown only for some runs (the room line), taken from the body.
 */
export function layoutFor(columns: number | undefined, rows: number | undefined, extraLines = 0): Layout {
  const width = Math.max(MIN_WIDTH, Math.floor(columns ?? MIN_WIDTH));
  // One line short of the terminal: a frame as tall as the screen makes ink clear the scrollback on every render.
  const height = Math.max(MIN_HEIGHT - 1, Math.floor((rows ?? MIN_HEIGHT) - 1));
  const numbersWidth = width >= 120 ? 44 : 38;
  const plotWidth = width - numbersWidth - 1;
  const body = height - CHROME_LINES - extraLines;
  const chartHeight = Math.max(6, Math.floor(body / 2));
  return { width, height, numbersWidth, plotWidth, bodyHeight: body, chartHeight, statusLines: 2 };
}

/** True when a terminal of this size cannot hold the frame (an unknown size is taken as large enough). */
export function tooSmall(columns: number | undefined, rows: number | undefined): boolean {
  return (columns !== undefined && columns < MIN_WIDTH) || (rows !== undefined && rows < MIN_HEIGHT);
}

/**
 * The one line shown instead of the frame in a terminal that cannot hold it: a frame wider or taller than the
 * terminal wraps and scrolls into an unreadable screen. The longest wording that fits the width.
 */
export function tooSmallLine(columns: number | undefined, rows: number | undefined): string {
  const size = `${columns ?? '?'}×${rows ?? '?'}`;
  const need = `${MIN_WIDTH}×${MIN_HEIGHT}`;
  const wordings = [
    `terminal ${size} is too small: the live view needs at least ${need} (enlarge it, or q to quit)`,
    `terminal ${size} too small: needs ${need}`,
    `too small: needs ${need}`,
    `needs ${need}`,
  ];
  const w = columns ?? MIN_WIDTH;
  return wordings.find((t) => [...t].length <= w) ?? wordings[wordings.length - 1]!.slice(0, Math.max(1, w));
}

/** Width of `label value` items joined by ` · `. */
function itemsWidth(items: readonly { label: string; value: string }[]): number {
  return items.reduce((w, it, i) => w + (i ? 3 : 0) + it.label.length + 1 + [...it.value].length, 0);
}

/**
 * Fits `label value` items, joined by ` · `, into one line of `width` columns. Values with a `short` wording take it
 * first (the longest first); values marked `shrink` (paths) then lose their beginning, marked with `…`, so the end
 * of a path stays readable; then items drop, those marked `dropFirst` before the others, each from the end.
 */
export function fitItems<T extends { label: string; value: string; shrink?: boolean; short?: string; dropFirst?: boolean }>(items: readonly T[], width: number): T[] {
  const out = items.map((it) => ({ ...it }));
  const len = (v: string): number => [...v].length;
  for (let guard = 0; guard < 200 && out.length > 0 && itemsWidth(out) > width; guard++) {
    const over = itemsWidth(out) - width;
    const shorter = out.map((it, i) => [it, i] as const).filter(([it]) => it.short !== undefined && len(it.short) < len(it.value));
    if (shorter.length > 0) {
      const [it, i] = shorter.reduce((a, b) => (len(b[0].value) > len(a[0].value) ? b : a));
      out[i] = { ...it, value: it.short!, short: undefined };
      continue;
    }
    const candidates = out.map((it, i) => [it, i] as const).filter(([it]) => it.shrink && len(it.value) > 8);
    if (candidates.length === 0) {
      const first = out.findLastIndex((it) => it.dropFirst);
      out.splice(first >= 0 ? first : out.length - 1, 1);
      continue;
    }
    const [it, i] = candidates.reduce((a, b) => (len(b[0].value) > len(a[0].value) ? b : a));
    const chars = [...it.value];
    const keep = Math.max(7, chars.length - over - 1);
    out[i] = { ...it, value: `…${chars.slice(chars.length - keep).join('')}`, shrink: keep > 7 };
  }
  return out;
}
