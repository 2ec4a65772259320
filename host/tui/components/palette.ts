// The live view's colours: one place, so the screen keeps a single visual language.
import type { Tone } from '../view-model.ts';

/** Ink colour names per tone (terminal's 16 basic colours, readable on dark and light backgrounds). */
export const TONE_COLOR: Readonly<Record<Tone, string | undefined>> = {
  normal: undefined,
  good: 'green',
  bad: 'red',
  muted: 'gray',
  accent: 'cyan',
};

/** Chart tones: measured points stand out, the law and fits are quieter lines. */
export const CHART_COLOR: Readonly<Record<string, 'yellow' | 'magenta' | 'gray' | undefined>> = {
  points: 'yellow',
  law: 'magenta',
  fit: 'magenta',
  axis: 'gray',
  label: 'gray',
  blank: undefined,
};
