// Scales that map data values to SVG pixels, linear or logarithmic, with their ticks.
import { linearTicks, logTicks, logTickLabel, niceDomain, tickLabel } from './ticks.ts';

export type ScaleKind = 'linear' | 'log';

/** A map from a data domain to a pixel range, with ticks and tick labels for its axis. */
export interface Scale {
  readonly kind: ScaleKind;
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  map(v: number): number;
  ticks(): { value: number; label: string }[];
  /** True when `v` can be drawn on this scale (finite; positive on a log scale). */
  accepts(v: number): boolean;
}

/** A linear scale whose domain is widened to nice numbers (about `count` ticks). */
export function linearScale(domain: readonly [number, number], range: readonly [number, number], count = 5): Scale {
  const [d0, d1] = niceDomain(domain[0], domain[1], count);
  const [r0, r1] = range;
  const k = (r1 - r0) / (d1 - d0);
  return {
    kind: 'linear',
    domain: [d0, d1],
    range,
    map: (v) => r0 + (v - d0) * k,
    ticks: () => {
      const { ticks, step } = linearTicks(d0, d1, count);
      return ticks.map((value) => ({ value, label: tickLabel(value, step) }));
    },
    accepts: (v) => Number.isFinite(v),
  };
}

/** A base-10 log scale over a positive domain, widened to whole decades' 1-2-5 steps. */
export function logScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  const lo = Math.min(domain[0], domain[1]);
  const hi = Math.max(domain[0], domain[1]);
  if (!(lo > 0)) throw new RangeError('logScale needs a positive domain');
  const steps = [1, 2, 5, 10];
  const down = (v: number): number => {
    const d = 10 ** Math.floor(Math.log10(v));
    return [...steps].reverse().find((m) => m * d <= v * (1 + 1e-12))! * d;
  };
  const up = (v: number): number => {
    const d = 10 ** Math.floor(Math.log10(v));
    return steps.find((m) => m * d >= v * (1 - 1e-12))! * d;
  };
  let d0 = down(lo);
  let d1 = up(hi);
  if (!(d1 > d0)) d1 = d0 * 10;
  const [r0, r1] = range;
  const l0 = Math.log10(d0);
  const k = (r1 - r0) / (Math.log10(d1) - l0);
  return {
    kind: 'log',
    domain: [d0, d1],
    range,
    map: (v) => r0 + (Math.log10(v) - l0) * k,
    ticks: () => logTicks(d0, d1).map((value) => ({ value, label: logTickLabel(value) })),
    accepts: (v) => Number.isFinite(v) && v > 0,
  };
}
