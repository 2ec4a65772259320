// The stages of the analysis, each alone: periods, amplitudes, reduction to zero amplitude, corrections, budget, rows.
import { describe, expect, it } from 'vitest';
import { parseSimpleRig, type Rig } from '../../protocol/rig.ts';
import { ellipF, ellipK } from '../reference/elliptic.ts';
import { PASS_STATUSES, STATUS_CODE, passStatus, type ClockApplied, type SequencedPasses } from '../../host/analysis/passes.ts';
import { fillPeriodAmplitudes, periodAmplitude } from '../../host/analysis/stages/amplitudes.ts';
import { uncertaintyBudget } from '../../host/analysis/stages/budget.ts';
import { correctT0 } from '../../host/analysis/stages/corrections.ts';
import { findPeriods } from '../../host/analysis/stages/periods.ts';
import { reduceToZeroAmplitude } from '../../host/analysis/stages/reduction.ts';
import { swingRows } from '../../host/analysis/stages/swing-rows.ts';
import { lineT0 } from '../../host/analysis/stages/t0-line.ts';

const rigOf = (o: object): Rig => {
  const r = parseSimpleRig(o);
  if (!r.ok) throw new Error(r.error);
  return r.rig;
};
const RIG = rigOf({ length_m: 1, flag_width_m: 0.025, bob_diameter_m: 0.025, latitude_deg: 52 });

/**
 * Passes of an ideal undamped-law pendulum whose amplitude falls linearly: each half-period from the exact law
 * T/T0 = 2K(m)/π, m = sin²(θ/2), at the mean amplitude of its two passes (A&S 17.3, DLMF 19.2.8, via the independent elliptic functions in test/reference/elliptic.ts,
 * independent of host/analysis), each transit the exact time between ±φb, (2/ω0)·F(asin(sin(φb/2)/k) | m).
 */
function idealPasses(n: number, T0: number, fromDeg: number, toDeg: number, rig: Rig): { passes: SequencedPasses; theta: number[] } {
  const omega0 = (2 * Math.PI) / T0;
  const phiB = Math.asin(rig.flag_width_m / 2 / rig.length_m);
  const theta = Array.from({ length: n }, (_, i) => ((fromDeg + ((toDeg - fromDeg) * i) / (n - 1)) * Math.PI) / 180);
  const t: number[] = [];
  let now = 0;
  for (let i = 0; i < n; i++) {
    if (i > 0) now += (T0 / 2) * ((2 * ellipK(Math.sin((theta[i - 1]! + theta[i]!) / 4) ** 2)) / Math.PI);
    t.push(now);
  }
  const transit = theta.map((th) => {
    const k = Math.sin(th / 2);
    return (2 / omega0) * ellipF(Math.asin(Math.sin(phiB / 2) / k), k * k);
  });
  const passes: SequencedPasses = {
    t,
    td: t,
    transit,
    index: Int32Array.from({ length: n }, (_, i) => i),
    segment: new Int32Array(n),
    status: new Uint8Array(n),
    bridgedBefore: new Uint8Array(n),
  };
  return { passes, theta };
}

describe('pass status', () => {
  it('is a named union stored as a byte code, each name at its own code', () => {
    for (const s of PASS_STATUSES) expect(passStatus(Uint8Array.of(STATUS_CODE[s]), 0)).toBe(s);
    expect(new Set(Object.values(STATUS_CODE)).size).toBe(PASS_STATUSES.length);
  });
});

describe('periods stage', () => {
  it('takes half-periods from neighbours and periods from two numbers back, across a bridged gap and not across segments', () => {
    // Numbers 0 1 2 [3 missing] 4 5 | new segment 0 1 2
    const td = [0, 1, 2, 4, 5, 10, 11, 12];
    const passes: SequencedPasses = {
      t: td,
      td,
      transit: td.map(() => 0.01),
      index: Int32Array.of(0, 1, 2, 4, 5, 0, 1, 2),
      segment: Int32Array.of(0, 0, 0, 0, 0, 1, 1, 1),
      status: new Uint8Array(8),
      bridgedBefore: Uint8Array.of(0, 0, 0, 1, 0, 0, 0, 0),
    };
    const per = findPeriods(passes);
    expect([...per.half].map((x) => (Number.isNaN(x) ? null : x))).toEqual([null, 1, 1, null, 1, null, 1, 1]);
    expect([...per.period].map((x) => (Number.isNaN(x) ? null : x))).toEqual([null, null, 2, 2, null, null, null, 2]);
    expect([...per.start]).toEqual([-1, -1, 0, 2, -1, -1, -1, 5]);
    // The period 2 → 4 has no middle pass (3 was bridged).
    expect([...per.mid]).toEqual([-1, -1, 1, -1, -1, -1, -1, 6]);
    expect([...per.ends]).toEqual([2, 3, 7]);
    expect(per.validCount).toBe(8);
    expect(per.slowCount).toBe(0);
  });

  it('a pass that barely clears the beam (transit over a third of the half-period) gives no period', () => {
    const td = [0, 1, 2, 3, 4, 5];
    const transit = [0.01, 0.01, 0.01, 0.4, 0.01, 0.01];
    const passes: SequencedPasses = { t: td, td, transit, index: Int32Array.of(0, 1, 2, 3, 4, 5), segment: new Int32Array(6), status: new Uint8Array(6), bridgedBefore: new Uint8Array(6) };
    const per = findPeriods(passes);
    expect(per.slowCount).toBe(1);
    expect([...per.ends]).toEqual([2, 4]);
  });
});

describe('amplitudes stage', () => {
  it('a period takes (θa + 2θm + θb)/4, or (θa + θb)/2 without its middle pass', () => {
    expect(periodAmplitude([1, 2, 4], 0, 1, 2)).toBe(2.25);
    expect(periodAmplitude([1, 2, 4], 0, -1, 2)).toBe(2.5);
  });

  it('fills every valid pass, and the periods, with the same formula at any stride', () => {
    const td = [0, 1, 2, 3, 4, 5];
    const passes: SequencedPasses = { t: td, td, transit: td.map(() => 0.01), index: Int32Array.of(0, 1, 2, 3, 4, -1), segment: new Int32Array(6), status: new Uint8Array(6), bridgedBefore: new Uint8Array(6) };
    const per = findPeriods(passes);
    const amp = new Float64Array(6);
    const pAmp = new Float64Array(per.ends.length);
    fillPeriodAmplitudes(per, passes.index, (c) => c * c, amp, pAmp);
    expect([...amp].slice(0, 5)).toEqual([0, 1, 4, 9, 16]);
    expect(amp[5]).toBeNaN();
    expect([...pAmp]).toEqual([(0 + 2 + 4) / 4, (1 + 8 + 9) / 4, (4 + 18 + 16) / 4]);
    const pAmp2 = new Float64Array(per.ends.length).fill(NaN);
    fillPeriodAmplitudes(per, passes.index, (c) => c * c, new Float64Array(6).fill(NaN), pAmp2, 2);
    expect([pAmp2[0], pAmp2[2]]).toEqual([pAmp[0], pAmp[2]]);
    expect(pAmp2[1]).toBeNaN();
  });
});

describe('reduction and T0 line stages', () => {
  it('recover T0 and every amplitude of an exact-law decay from 40° to 5°', () => {
    const T0 = 2.006;
    const { passes, theta } = idealPasses(400, T0, 40, 5, RIG);
    const per = findPeriods(passes);
    const red = reduceToZeroAmplitude(passes, per, RIG);
    // Limits: a half-period is not exactly the law at its passes' mean amplitude (the law is curved; 0.09° per
    // pass here), which leaves T0 off by 3.8e-8 and the amplitudes by 2.7e-8 rad; the line, which smooths the
    // amplitudes over ±8 passes, by 2.2e-7.
    expect(Math.abs(red.T0mean! / T0 - 1)).toBeLessThan(1e-7);
    for (let c = 0; c < 400; c++) expect(Math.abs(red.amp[c]! - theta[c]!)).toBeLessThan(1e-7);
    const est = lineT0(passes, per, red, RIG);
    expect(Math.abs(est.T0! / T0 - 1)).toBeLessThan(5e-7);
    expect(est.line).not.toBeNull();
  });

  it('without a rig: no amplitudes, T0 is the mean of the raw periods', () => {
    const { passes } = idealPasses(50, 2, 3, 3, RIG);
    const red = reduceToZeroAmplitude(passes, findPeriods(passes), null);
    expect(red.amp.every((a) => Number.isNaN(a))).toBe(true);
    expect(red.T0mean).toBeCloseTo(2 * ((2 * ellipK(Math.sin((3 * Math.PI) / 360) ** 2)) / Math.PI), 12);
  });
});

describe('corrections and budget stages', () => {
  const clock: ClockApplied = { source: 'host', ppm: 12, u_ppm: 0.5, measured: true, drift_ppm_per_h: null, span_s: 3600, residuals: { host_s: [], residual_s: [] } };

  it('the damping correction is found by its id: T0 shortened by 1/√(1 − 1/(4Q²)) − 1', () => {
    const c = correctT0(RIG, 2, 300);
    expect(c.T0).toBeCloseTo(2 / (1 / Math.sqrt(1 - 1 / (4 * 300 * 300))), 15);
    expect(c.model!.lines.map((l) => l.id)).toEqual(['finite-bob', 'string-mass', 'air', 'damping']);
  });

  it('budget rows carry stable, unique ids apart from their display text, and combine to g_u', () => {
    const { passes } = idealPasses(400, 2.006, 30, 10, RIG);
    const periods = findPeriods(passes);
    const reduction = reduceToZeroAmplitude(passes, periods, RIG);
    const { T0, line } = lineT0(passes, periods, reduction, RIG);
    const corrected = correctT0(RIG, T0, null);
    const b = uncertaintyBudget({ rig: RIG, passes, periods, reduction, line, T0, corrected, clock, delay: { difference_s: 0, difference_u_s: 5e-6, statistical_u_s: 5e-6, width_shift_s: 0, source: 'prior' } });
    const ids = b.rows.map((r) => r.id);
    expect(ids.slice(0, 5)).toEqual(['length', 'statistics', 'clock', 'flag-width', 'delay-difference']);
    expect(new Set(ids).size).toBe(ids.length);
    expect(b.rows.find((r) => r.id === 'clock')!.u_rel_g).toBeCloseTo(1e-6, 15);
    expect(b.g_u! / corrected.g!).toBeCloseTo(Math.hypot(...b.rows.map((r) => r.u_rel_g)), 15);
    // The flag-width term: the reduction moves with w (the effect grows like θ³), so it is not zero at 30°.
    expect(b.rows.find((r) => r.id === 'flag-width')!.u_rel_g).toBeGreaterThan(0);
  });
});

describe('swing rows stage', () => {
  it('flags each pass by its status, bridging, slowness and segment start', () => {
    const td = [0, 1, 2, 3, 4];
    const passes: SequencedPasses = {
      t: td,
      td,
      transit: [0.01, 0.01, 0.01, 0.01, 0.01],
      index: Int32Array.of(0, 1, -1, 3, -1),
      segment: Int32Array.of(0, 0, -1, 0, -1),
      status: Uint8Array.of(STATUS_CODE.valid, STATUS_CODE.valid, STATUS_CODE['rejected-timing'], STATUS_CODE.valid, STATUS_CODE.unsequenced),
      bridgedBefore: Uint8Array.of(0, 0, 0, 1, 0),
    };
    const per = findPeriods(passes);
    const rows = swingRows(passes, per, reduceToZeroAmplitude(passes, per, null), false);
    expect(rows.map((r) => r.flags)).toEqual([['segment-start:0'], [], ['rejected:timing'], ['bridged:1'], ['unsequenced']]);
  });
});
