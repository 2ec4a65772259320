// Screen geometry for the live view: how 80×24 (or more) is shared between status, numbers, plots and footer.

export interface Layout {
  readonly width: number;
  readonly height: number;
  /** Width of the numbers column (left); the plots take the rest. */
  readonly numbersWidth: number;
  readonly plotWidth: number;
  /** Lines of each of the two stacked charts. */
  readonly chartHeight: number;
  readonly statusLines: number;
}

export const MIN_WIDTH = 80;
export const MIN_HEIGHT = 24;
/** Lines outside the body: status, health, warning, footer (status takes two). */
const CHROME_LINES = 5;

/** Divides the terminal; never smaller than 80×24 so the frame never outgrows a standard terminal's layout. */
export function layoutFor(columns: number | undefined, rows: number | undefined): Layout {
  const width = Math.max(MIN_WIDTH, Math.floor(columns ?? MIN_WIDTH));
  // One line short of the terminal: a frame as tall as the screen makes ink clear the scrollback on every render.
  const height = Math.max(MIN_HEIGHT - 1, Math.floor((rows ?? MIN_HEIGHT) - 1));
  const numbersWidth = width >= 120 ? 44 : 38;
  const plotWidth = width - numbersWidth - 1;
  const body = height - CHROME_LINES;
  const chartHeight = Math.max(6, Math.floor(body / 2));
  return { width, height, numbersWidth, plotWidth, chartHeight, statusLines: 2 };
}

/** Packs `label value` items into at most `maxLines` lines of `width` columns, separated by ` · `; what does not fit is dropped. */
export function packItems<T extends { label: string; value: string }>(items: readonly T[], width: number, maxLines: number): T[][] {
  const lines: T[][] = [];
  let current: T[] = [];
  let used = 0;
  for (const it of items) {
    const w = it.label.length + 1 + it.value.length;
    const need = current.length ? used + 3 + w : w;
    if (need <= width) {
      current.push(it);
      used = need;
      continue;
    }
    if (current.length) lines.push(current);
    if (lines.length >= maxLines) return lines;
    current = [{ ...it, value: w > width ? it.value.slice(0, Math.max(0, width - it.label.length - 2)) + '…' : it.value }];
    used = Math.min(width, w);
  }
  if (current.length && lines.length < maxLines) lines.push(current);
  return lines;
}
