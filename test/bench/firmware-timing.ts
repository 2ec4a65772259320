// Figure 4, firmware timing in the emulator: captured tick − applied cycle per channel, and the highest
// sustained edge rate with zero loss, for the product firmware and for a polling-loop baseline on the same schedule.
import { join } from 'node:path';
import { decodeLine } from '../../protocol/decode.ts';
import type { EdgeRecord, HeartbeatRecord, HelloRecord } from '../../protocol/records.ts';
import { runFirmware, type AppliedChange, type FirmwareEdge, type FirmwareRun } from '../../sim/emulator/run-firmware.ts';
import { missingToolchain } from '../../sim/emulator/toolchain.ts';
import { NotMeasured, type BenchContext, type Benchmark } from './benchmark.ts';
import { buildPollBaseline } from './poll-baseline.ts';
import type { FigureResult, Row } from './report.ts';
import { Rng } from '../../sim/index.ts';
import { max, min, quantile, stdev } from './stats.ts';

const EMU_HZ = 16e6;
/** The product firmware samples its entropy for ~33 ms at boot; edges start after it is ready. */
const START_S = 0.1;
/** Bisection bounds of the edge-rate search (edges/s): the low one passes, the high one is far past the UART. */
const LOW_RATE = 200;
const HIGH_RATE = 5000;
/** Burst test: edges 50 µs apart, far faster than any UART line rate. */
const BURST_RATE = 20_000;

interface Decoded {
  readonly hello: HelloRecord | null;
  readonly edges: EdgeRecord[];
  readonly lastBeat: HeartbeatRecord | null;
  readonly bad: number;
}

function decode(run: FirmwareRun): Decoded {
  let hello: HelloRecord | null = null;
  let lastBeat: HeartbeatRecord | null = null;
  const edges: EdgeRecord[] = [];
  let bad = 0;
  for (const line of run.lines) {
    const d = decodeLine(line);
    if (!d.ok) {
      bad++;
      continue;
    }
    if (d.record.kind === 'E') edges.push(d.record);
    else if (d.record.kind === 'H') hello = d.record;
    else if (d.record.kind === 'T') lastBeat = d.record;
  }
  return { hello, edges, lastBeat, bad };
}

function gcd(a: number, b: number): number {
  while (b) [a, b] = [b, a % b];
  return a;
}

/**
 * Edges alternate between the channels, 2.0–2.5 ms apart at random sub-cycle phases, so neither firmware is
 * still printing the previous line when the next edge comes: the distribution shows resolution and latency
 * jitter alone. (Blocking while printing shows in the edge-rate rows.)
 */
function timingSchedule(n: number, seed: number): FirmwareEdge[] {
  const rng = new Rng(seed);
  const out: FirmwareEdge[] = [];
  const level: [0 | 1, 0 | 1] = [0, 0];
  let t = START_S;
  for (let i = 0; i < n; i++) {
    const ch = (i % 2) as 0 | 1;
    level[ch] = level[ch] === 0 ? 1 : 0;
    out.push({ t_s: t, ch, level: level[ch] });
    t += 0.002 + 0.0005 * rng.uniform();
  }
  return out;
}

/** Distribution of (stamp − reference) in ns, the median removed from the spread figures. */
interface Spread {
  readonly medianNs: number;
  readonly stdNs: number;
  readonly p01Ns: number;
  readonly p99Ns: number;
  readonly minNs: number;
  readonly maxNs: number;
}

interface ChannelTiming {
  readonly n: number;
  /** Resolution of the timestamps, ns (tick size × the gcd of all stamps). */
  readonly resolutionNs: number;
  /** Against the cycle at which simavr applied each change. */
  readonly vsApplied: Spread;
  /** Against the requested (true) edge time, sub-cycle phase included. */
  readonly vsTrue: Spread;
  /** Edge lines whose r/f disagrees with the level applied. */
  readonly mismatched: number;
}

const NS_PER_CYCLE = 1e9 / EMU_HZ;

function spread(cycles: readonly number[]): Spread {
  const ns = cycles.map((c) => c * NS_PER_CYCLE);
  const med = quantile(ns, 0.5);
  return { medianNs: med, stdNs: stdev(ns), p01Ns: quantile(ns, 0.01) - med, p99Ns: quantile(ns, 0.99) - med, minNs: min(ns) - med, maxNs: max(ns) - med };
}

/** Pairs the k-th edge line of a channel with the k-th change of that channel (both firmwares print in order). */
function channelTiming(ch: 0 | 1, d: Decoded, schedule: readonly FirmwareEdge[], applied: readonly AppliedChange[], originCycle: number): ChannelTiming | string {
  const hz = d.hello?.hz;
  if (!hz || EMU_HZ % hz !== 0) return 'no usable hello line';
  const cyclesPerTick = EMU_HZ / hz;
  const lines = d.edges.filter((e) => e.ch === ch);
  const changes = applied.filter((a) => a.ch === ch);
  const wanted = schedule.filter((e) => e.ch === ch);
  if (lines.length !== changes.length || changes.length !== wanted.length) return `${wanted.length} changes, ${changes.length} applied, ${lines.length} edge lines`;
  const vsApplied: number[] = [];
  const vsTrue: number[] = [];
  let g = 0;
  let mismatched = 0;
  for (let i = 0; i < lines.length; i++) {
    const e = lines[i]!;
    const a = changes[i]!;
    if ((e.edge === 'r') !== (a.level === 1)) mismatched++;
    g = gcd(g, e.ticks);
    const stampCycle = e.ticks * cyclesPerTick + originCycle;
    vsApplied.push(stampCycle - a.cycle);
    vsTrue.push(stampCycle - wanted[i]!.t_s * EMU_HZ);
  }
  return { n: lines.length, resolutionNs: g * cyclesPerTick * NS_PER_CYCLE, vsApplied: spread(vsApplied), vsTrue: spread(vsTrue), mismatched };
}

/** True when `n` edges at `rate` edges/s on ch 0 come out with every edge and no loss. */
async function zeroLossAt(rate: number, spanS: number, elfPath: string | undefined, n = Math.floor(rate * spanS)): Promise<{ ok: boolean; missing: number; reportedLost: number }> {
  const edges: FirmwareEdge[] = [];
  for (let i = 0; i < n; i++) edges.push({ t_s: START_S + i / rate, ch: 0, level: (i % 2 === 0 ? 1 : 0) as 0 | 1 });
  const run = await runFirmware({ edges, durationS: START_S + n / rate + 0.3, ...(elfPath ? { elfPath } : {}) });
  const d = decode(run);
  const got = d.edges.filter((e) => e.ch === 0).length;
  const reportedLost = d.lastBeat?.lost ?? 0;
  return { ok: got === n && reportedLost === 0 && d.bad === 0, missing: n - got, reportedLost };
}

/** Longest burst at BURST_RATE that comes out whole, by bisection on the edge count (1 to 1024). */
async function longestBurst(elfPath: string | undefined, steps: number): Promise<number> {
  let lo = 1;
  let hi = 1024;
  for (let i = 0; i < steps && hi - lo > 1; i++) {
    const mid = Math.round((lo + hi) / 2);
    if ((await zeroLossAt(BURST_RATE, 0, elfPath, mid)).ok) lo = mid;
    else hi = mid;
  }
  return lo;
}

/** Highest rate (edges/s) with zero loss, by bisection on a log scale between `lo` (must pass) and `hi`. */
async function maxZeroLossRate(ctx: BenchContext, name: string, spanS: number, elfPath: string | undefined, steps: number): Promise<number> {
  let lo = LOW_RATE;
  let hi = HIGH_RATE;
  if (!(await zeroLossAt(lo, spanS, elfPath)).ok) return 0;
  for (let i = 0; i < steps; i++) {
    const mid = Math.sqrt(lo * hi);
    const r = await zeroLossAt(mid, spanS, elfPath);
    if (r.ok) lo = mid;
    else hi = mid;
    ctx.progress(`${name}: ${Math.round(mid)} edges/s ${r.ok ? 'no loss' : `lost ${r.missing} (reported ${r.reportedLost})`}`);
  }
  return lo;
}

function timingRows(ch: 0 | 1, what: string, fw: ChannelTiming | string, base: ChannelTiming | string): Row[] {
  const label = `ch ${ch} (${what})`;
  if (typeof fw === 'string' || typeof base === 'string') {
    return [{ figure: `${label} timing`, value: null, unit: 'ns', note: `firmware: ${typeof fw === 'string' ? fw : 'ok'}; baseline: ${typeof base === 'string' ? base : 'ok'}` }];
  }
  const range = (s: Spread): string => `${s.minNs.toFixed(1)}…+${s.maxNs.toFixed(1)} ns`;
  const ratio = (b: number, f: number): number | null => (f > 0 ? b / f : null);
  const w = (s: Spread): number => s.p99Ns - s.p01Ns;
  return [
    { figure: `${label} resolution`, value: fw.resolutionNs, unit: 'ns', baselineName: 'polling loop', baseline: base.resolutionNs, ratio: base.resolutionNs / fw.resolutionNs, note: 'ratios in this figure are baseline / firmware (how many times finer)' },
    {
      figure: `${label} sd of stamp − applied cycle`,
      value: fw.vsApplied.stdNs,
      unit: 'ns',
      baselineName: 'polling loop',
      baseline: base.vsApplied.stdNs,
      ratio: ratio(base.vsApplied.stdNs, fw.vsApplied.stdNs),
      note: `${fw.n} edges, ${fw.mismatched} with the wrong r/f; firmware constant latency ${fw.vsApplied.medianNs.toFixed(1)} ns (removed), range ${range(fw.vsApplied)}; baseline range ${range(base.vsApplied)}`,
    },
    {
      figure: `${label} sd of stamp − true edge time`,
      value: fw.vsTrue.stdNs,
      unit: 'ns',
      baselineName: 'polling loop',
      baseline: base.vsTrue.stdNs,
      ratio: ratio(base.vsTrue.stdNs, fw.vsTrue.stdNs),
      note: `includes the sub-cycle phase and simavr applying a change at the next instruction boundary; firmware range ${range(fw.vsTrue)}, baseline ${range(base.vsTrue)}`,
    },
    { figure: `${label} 1–99 % width, stamp − true time`, value: w(fw.vsTrue), unit: 'ns', baselineName: 'polling loop', baseline: w(base.vsTrue), ratio: ratio(w(base.vsTrue), w(fw.vsTrue)) },
  ];
}

async function run(ctx: BenchContext): Promise<FigureResult> {
  const missing = missingToolchain();
  if (missing.length > 0) throw new NotMeasured(`toolchain missing: ${missing.join(', ')}`);
  const nEdges = ctx.quick ? 60 : 3000;
  const schedule = timingSchedule(nEdges, 7);
  const durationS = schedule[schedule.length - 1]!.t_s + 0.2;
  ctx.progress(`product firmware: ${nEdges} edges`);
  const fwRun = await runFirmware({ edges: schedule, durationS });
  const baud = fwRun.hz / ((fwRun.u2x ? 8 : 16) * (fwRun.ubrr + 1));
  const elf = buildPollBaseline(join(ctx.workDir, 'poll-baseline'), fwRun.ubrr, fwRun.u2x);
  ctx.progress(`polling baseline (UBRR0 ${fwRun.ubrr}, U2X0 ${fwRun.u2x}, as the firmware set them): same schedule`);
  const baseRun = await runFirmware({ edges: schedule, durationS, elfPath: elf });
  const fw = decode(fwRun);
  const base = decode(baseRun);
  // Device tick 0 is the cycle where Timer1 started; the baseline's µs counter starts near cycle 0 (its constant is removed anyway).
  const fwCh0 = channelTiming(0, fw, schedule, fwRun.applied, fwRun.timer1StartCycle);
  const fwCh1 = channelTiming(1, fw, schedule, fwRun.applied, fwRun.timer1StartCycle);
  const baseCh0 = channelTiming(0, base, schedule, baseRun.applied, 0);
  const baseCh1 = channelTiming(1, base, schedule, baseRun.applied, 0);
  const rows: Row[] = [...timingRows(0, 'input capture', fwCh0, baseCh0), ...timingRows(1, 'INT0', fwCh1, baseCh1)];

  const spanS = ctx.quick ? 0.1 : 2;
  const steps = ctx.quick ? 1 : 8;
  ctx.progress(`max sustained edge rate with zero loss, ${spanS} s square wave on ch 0, ${steps} bisection steps each`);
  const fwMax = await maxZeroLossRate(ctx, 'firmware', spanS, undefined, steps);
  const baseMax = await maxZeroLossRate(ctx, 'baseline', spanS, elf, steps);
  // What the UART can carry: 10 bits per byte; an edge line late in the run is about this long.
  const lineBytes = fw.edges.length > 0 ? fw.edges[fw.edges.length - 1]!.seq.toString(16).length + 17 : 22;
  rows.push({
    figure: `max sustained edge rate, zero loss, ${baud} baud`,
    value: fwMax,
    unit: 'edges/s',
    baselineName: 'polling loop',
    baseline: baseMax,
    ratio: baseMax > 0 ? fwMax / baseMax : null,
    target: `near the UART's ${Math.round(baud / 10 / lineBytes)} lines/s`,
    note: `square wave for ${spanS} s; bisection to about ${(((HIGH_RATE / LOW_RATE) ** (1 / 2 ** steps) - 1) * 100).toFixed(0)} %; the UART figure assumes ${lineBytes}-byte lines and ignores heartbeats`,
  });

  const burstSteps = ctx.quick ? 2 : 10;
  const fwBurst = await longestBurst(undefined, burstSteps);
  const baseBurst = await longestBurst(elf, burstSteps);
  rows.push({
    figure: `longest burst with zero loss, edges ${1e6 / BURST_RATE} µs apart`,
    value: fwBurst,
    unit: 'edges',
    baselineName: 'polling loop',
    baseline: baseBurst,
    ratio: fwBurst / baseBurst,
    note: "the firmware's edge ring and UART buffer against a loop that blocks while it prints",
  });

  // Above the limit: does each firmware say how many edges it dropped?
  const over = Math.max(fwMax, baseMax) * 2;
  const fwOver = await zeroLossAt(over, spanS, undefined);
  const baseOver = await zeroLossAt(over, spanS, elf);
  rows.push({
    figure: `edges lost at ${Math.round(over)} edges/s that the device reported`,
    value: fwOver.missing > 0 ? fwOver.reportedLost / fwOver.missing : null,
    unit: '',
    baselineName: 'polling loop',
    baseline: baseOver.missing > 0 ? baseOver.reportedLost / baseOver.missing : null,
    target: '1 (every loss counted)',
    met: fwOver.missing > 0 && fwOver.reportedLost === fwOver.missing,
    note: `firmware: ${fwOver.missing} missing, ${fwOver.reportedLost} reported in T lost; baseline: ${baseOver.missing} missing, no loss count in its output`,
  });

  return {
    id: 'firmware',
    title: 'firmware timing in the emulator',
    rows,
    details: { baud, edges: nEdges, firmware: { ch0: fwCh0, ch1: fwCh1, maxRate: fwMax, burst: fwBurst, over: fwOver }, baseline: { ch0: baseCh0, ch1: baseCh1, maxRate: baseMax, burst: baseBurst, over: baseOver } },
  };
}

export const firmwareTiming: Benchmark = { id: 'firmware', title: 'firmware timing in the emulator', run };
