// hardware-notes/reversible-pendulum.md: its rig files validate, and the figures its text computes are what the formulas give.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { besselG } from '../../host/analysis/bessel.ts';
import { periodRatio } from '../../host/analysis/elliptic.ts';
import { isSimpleRig, parseRig } from '../../protocol/rig.ts';
import { fencedBlocks } from './markdown.ts';

const note = readFileSync(new URL('../../hardware-notes/reversible-pendulum.md', import.meta.url), 'utf8');
const rigs = fencedBlocks(note)
  .filter((b) => b.info === 'json')
  .map((b) => b.lines.join('\n'));

describe('hardware-notes/reversible-pendulum.md', () => {
  it('shows a reversible rig and a two-length rig, and both validate with the project parser', () => {
    expect(rigs).toHaveLength(2);
    const [bar, string] = rigs.map((t) => parseRig(t));
    if (!bar!.ok || !string!.ok) throw new Error(`${bar!.ok ? '' : bar!.error} ${string!.ok ? '' : string!.error}`);
    expect(isSimpleRig(bar!.rig)).toBe(false);
    expect(isSimpleRig(string!.rig)).toBe(true);
    // The text derives pivot 2's cm_distance_m as l − h1 = 0.3136.
    if (!isSimpleRig(bar!.rig)) expect(bar!.rig.edge_distance_m - bar!.rig.cm_distance_m).toBeCloseTo(0.3136, 4);
  });

  it('the flag radius: at 3° an error δR/R moves the period by 3.4e-4·δR/R (exact law, docs/references.md#ref-period-ratio)', () => {
    const th = (3 * Math.PI) / 180;
    const dR = 1e-3 / 1.08;
    // The amplitude read from a transit scales as 1/R, so a radius read long by δR gives an amplitude short by δR/R.
    const shift = periodRatio(th) / periodRatio(th * (1 - dR)) - 1;
    expect(shift / dR).toBeCloseTo(3.4e-4, 5);
    expect(shift).toBeLessThan(3.3e-7);
  });

  it('h1 − h2 of the bundled bar: 2 mm is 3.7e-6 of g at T1 − T2 = 0.51 ms (docs/references.md#ref-reversible-pendulum)', () => {
    const p = (T: number) => ({ T_s: T, u_stat_s: 0, u_amp_s: 0 });
    // The bundled bar: l = 1 m, h1 = 0.6864 m, h2 = 0.3136 m, T ≈ 2.006 s, T1 − T2 = 0.51 ms (sim/sessions/reversible-bar.json).
    const b = besselG({ pivot1: p(2.0060 + 0.00051), pivot2: p(2.0060), l_m: 1, l_u_m: 0, h1_m: 0.6864, h2_m: 0.3136, dh_u_m: 0.002, clock_u_rel: 0 })!;
    expect(b.budget.find((r) => r.id === 'centre-of-mass-distances')!.u_rel_g).toBeCloseTo(3.7e-6, 7);
  });
});
