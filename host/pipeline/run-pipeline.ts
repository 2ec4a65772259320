// The one pipeline: journal entries → decoded records → edges → passes → analysis, identical live and in batch.
//
// `push` is cheap and incremental (decoding, sequence tracking, edge cleaning into compact pass columns);
// `result` runs the full analysis over everything pushed so far without changing the state, so calling it (or
// `live`) at any moment never changes later numbers.
import type { RoomReading } from '../analysis/room-drift.ts';
import type { JournalEntry } from '../../protocol/journal.ts';
import type { RejectReason } from '../../protocol/records.ts';
import { parseRig, swingView, type AnyRig, type Rig } from '../../protocol/rig.ts';
import { SequenceTracker } from '../../protocol/sequence.ts';
import { bootOffsets, type BootHeartbeats, type BootPps } from '../analysis/clock-calibration.ts';
import { analyzeRun } from '../analysis/analyze-run.ts';
import { STATUS_CODE } from '../analysis/passes.ts';
import { periodRatio } from '../analysis/elliptic.ts';
import type { AnalysisResult, RunCounts } from '../analysis/result.ts';
import { amplitudeFromTransit, blockHalfAngle } from '../analysis/transit-amplitude.ts';
import { chooseClock, type ClockOption } from './clock-choice.ts';
import { decodeDeviceLine } from './fast-decode.ts';
import { F64Column, I32Column } from './growable.ts';
import { RECENT_POINTS, type LiveHello, type LiveState } from './live-state.ts';
import { PassBuilder } from './pass-builder.ts';
import { runPlane } from '../analysis/plane-of-run.ts';
import { oneBeamPlaneRisk, oneBeamPlaneText } from '../analysis/plane-warning.ts';
import type { Blocked } from '../analysis/plane-passes.ts';
import { sequencePasses, type SequencingOptions } from './pass-sequencing.ts';

/** Options of a pipeline. */
export interface PipelineOptions {
  /** The rig; without it the journal's `#rig` line is used. */
  readonly rig?: Rig;
  /** Clock correction: `host`, `pps`, `nominal` or a rate error in ppm; default auto (PPS if present, else host if long enough). */
  readonly clock?: ClockOption;
  /** Channel of a 1 PPS reference (default 1, ignored when it is one of the rig's beams). */
  readonly ppsChannel?: number;
  /** Blocked intervals shorter than this are glitches (s); default 10 % of the transit of a 90° swing, 20 µs–2 ms. */
  readonly glitchS?: number;
  /** Unblocked gaps shorter than this inside a transit are bounce (s); same default as glitchS. */
  readonly bounceS?: number;
  readonly sequencing?: SequencingOptions;
  /** Standard uncertainty of the sensor's on/off delay difference, s (default 5 µs). */
  readonly delayDifferenceU_s?: number;
}

/** The pipeline object. */
export interface RunPipeline {
  /** Feeds one journal entry. */
  push(entry: JournalEntry): void;
  /** A cheap snapshot for live views; `nowHostUs` (µs since `#start`) sets the heartbeat age. */
  live(nowHostUs?: number): LiveState;
  /**
   * The full analysis of everything pushed so far (deterministic; does not change the pipeline).
   * `rows: false` leaves `swings` empty (faster, for a summary or JSON that does not print them).
   */
  result(opts?: { rows?: boolean }): AnalysisResult;
  /** Restarts the live running estimates (mean period) from `hostUs` on; the batch result is unaffected. */
  restartEstimates(hostUs: number): void;
  /** The rig in use (given, or from the journal), if any; a reversible pendulum's as its swingView. */
  rig(): Rig | null;
  /** The journal's own #rig as its file gives it (a reversible pendulum included), if it had a usable one. */
  journalRig(): AnyRig | null;
}

const TWO48 = 2 ** 48;
const G_N = 9.80665;

/**
 * Transit time of a 90° swing, w/v at the bottom with v = 2√(gL)·sin 45°: shorter than any transit of a real
 * swing, so a fraction of it separates detector chatter and glitches from transits. Without a rig: 5 ms.
 */
export function shortestTransitS(rig: Rig | null): number {
  if (!rig) return 5e-3;
  return rig.flag_width_m / (2 * Math.sqrt(G_N * rig.length_m) * Math.SQRT1_2);
}

/** A pass builder's closed intervals on the host-joined timebase. */
function blockedOf(p: PassBuilder, joined: (boot: number, ticks: number) => number): Blocked[] {
  const out: Blocked[] = [];
  for (let i = 0; i < p.passes.length; i++) out.push({ start: joined(p.passes.boot.at(i), p.passes.start.at(i)), end: joined(p.passes.boot.at(i), p.passes.end.at(i)) });
  return out;
}

/** Glitch/bounce default: 10 % of the shortest plausible transit (see shortestTransitS), within 20 µs–2 ms. */
export function defaultEdgeThresholdS(rig: Rig | null): number {
  return Math.min(2e-3, Math.max(2e-5, 0.1 * shortestTransitS(rig)));
}

/** Amplitude (degrees) of one live swing: ω0 from its period, reduced to zero amplitude in two rounds. */
function liveAmplitude(rig: Rig, transit: number, period: number | null): number | null {
  if (period === null) return null;
  const phiB = blockHalfAngle(rig.flag_width_m, rig.length_m);
  let t0 = period;
  let amp: number | null = null;
  for (let k = 0; k < 3; k++) {
    const a = amplitudeFromTransit(transit, phiB, (2 * Math.PI) / t0);
    if (!Number.isFinite(a)) break;
    amp = (a * 180) / Math.PI;
    t0 = period / periodRatio(a);
  }
  return amp;
}

/** Creates a pipeline. */
export function createRunPipeline(opts: PipelineOptions = {}): RunPipeline {
  const tracker = new SequenceTracker();
  const warnings: string[] = [];
  let journalRig: Rig | null = null;
  let journalFileRig: AnyRig | null = null;
  const rigNow = (): Rig | null => opts.rig ?? journalRig;
  let startIso: string | null = null;
  let source: string | null = null;
  let hello: LiveHello | null = null;
  let lastHostUs: number | null = null;
  let lastBeatHostUs: number | null = null;
  let levels: number | null = null;
  const c = { crc: 0, bad: 0, lost: 0, disconnects: 0, malformed: 0, otherEdges: 0 };
  let rejectedSinceGood = 0;
  const rejections: Partial<Record<RejectReason, number>> = {};
  // Per boot: nominal hz, tick unwrap state, the first (host, ticks) seen, the largest `lost`.
  const bootHz: number[] = [];
  const bootFirst: { hostUs: number; ticks: number }[] = [];
  const bootLost: number[] = [];
  let boot = -1;
  let wrapBase = 0;
  let lastRaw = -1;
  let hzNow = 16_000_000;
  let sawHello = false;
  const hb = { boot: new I32Column(), ticks: new F64Column(), hostUs: new F64Column() };
  const room: RoomReading[] = [];
  const pps = { boot: new I32Column(), ticks: new F64Column() };
  let builder: PassBuilder | null = null;
  /** The second beam's passes, when the rig has two (docs/two-beam-geometry.md). */
  let builderB: PassBuilder | null = null;
  let glitchS = 0;
  let bounceS = 0;
  const ppsCh = opts.ppsChannel ?? 1;

  // Live state.
  // Amplitudes of recent swings are solved lazily, in live(): batch runs never pay for them.
  const recent = { t: [] as number[], period: [] as (number | null)[], amp: [] as (number | null | undefined)[], transit: [] as number[] };
  let liveLast: { boot: number; t: number } | null = null;
  let liveHalf: [number | null, number | null] = [null, null];
  let livePeriod: number | null = null;
  let liveTransit: number | null = null;
  let meanSum = 0;
  let meanN = 0;
  let restartUs = -Infinity;
  const givenPpm = typeof opts.clock === 'number' ? opts.clock : 0;

  const ticksPerS = (b: number): number => (bootHz[b] ?? hzNow) * (1 + givenPpm * 1e-6);
  const onPass = (i: number): void => {
    const p = builder!.passes;
    const b = p.boot.at(i);
    const first = bootFirst[b]!;
    const tps = ticksPerS(b);
    const t = first.hostUs / 1e6 + (0.5 * (p.start.at(i) + p.end.at(i)) - first.ticks) / tps;
    const transit = (p.end.at(i) - p.start.at(i)) / tps;
    let period: number | null = null;
    if (liveLast && liveLast.boot === b) {
      const h = t - liveLast.t;
      liveHalf = [liveHalf[1], h];
      period = liveHalf[0] !== null ? liveHalf[0] + h : null;
    } else liveHalf = [null, null];
    liveLast = { boot: b, t };
    livePeriod = period;
    liveTransit = transit;
    if (period !== null && p.hostUs.at(i) >= restartUs) (meanSum += period), meanN++;
    recent.t.push(t);
    recent.period.push(period);
    recent.amp.push(undefined);
    recent.transit.push(transit);
    if (recent.t.length > RECENT_POINTS) for (const k of ['t', 'period', 'amp', 'transit'] as const) recent[k].shift();
  };

  const ensureBuilder = (): PassBuilder => {
    if (!builder) {
      glitchS = opts.glitchS ?? defaultEdgeThresholdS(rigNow());
      bounceS = opts.bounceS ?? defaultEdgeThresholdS(rigNow());
      builder = new PassBuilder(ticksPerS, glitchS, bounceS, 4 * bounceS, onPass);
      if (rigNow()?.beams.length === 2) builderB = new PassBuilder(ticksPerS, glitchS, bounceS, 4 * bounceS, () => undefined);
    }
    return builder;
  };

  /** Beam A's passes on the clock's timebase, the pending one included; with two beams, the plane and the square-crossing transits. */
  const passColumns = (k: number, offsets: ReturnType<typeof bootOffsets>, rig: Rig | null) => {
    // Passes, the pending one included (a snapshot, not a state change). The pass time is the middle of the
    // blocked interval: the swing is time-symmetric about the lowest point, so for a centred beam the midpoint is
    // the crossing time exactly; sensor delays shift every midpoint alike and cancel in intervals (DEVELOPERS.md).
    const pb = builder;
    const pend = pb?.pendingPass() ?? null;
    const np = (pb?.passes.length ?? 0) + (pend ? 1 : 0);
    const t = new Float64Array(np);
    const td = new Float64Array(np);
    const transit = new Float64Array(np);
    const pBoot = new Int32Array(np);
    // Ticks of a boot → seconds on the host-joined timebase.
    const joined = (b: number, ticks: number): number => {
      const tps = (bootHz[b] ?? hzNow) * k;
      const first = bootFirst[b]!;
      return (offsets.get(b) ?? first.hostUs / 1e6 - first.ticks / tps) + ticks / tps;
    };
    const blockedA: Blocked[] = [];
    for (let i = 0; i < np; i++) {
      const fromPending = i === np - 1 && pend !== null;
      const b = fromPending ? pend.boot : pb!.passes.boot.at(i);
      const s = fromPending ? pend.start : pb!.passes.start.at(i);
      const e = fromPending ? pend.end : pb!.passes.end.at(i);
      const tps = (bootHz[b] ?? hzNow) * k;
      td[i] = (0.5 * (s + e)) / tps;
      t[i] = joined(b, 0) + td[i]!;
      transit[i] = (e - s) / tps;
      pBoot[i] = b;
      if (builderB) blockedA.push({ start: joined(b, s), end: joined(b, e) });
    }
    const plane = rig && builderB ? runPlane(rig, blockedA, blockedOf(builderB, joined)) : null;
    // Two beams: amplitude, damping and Q run on the transit a square crossing would have had.
    if (plane) for (let i = 0; i < np; i++) if (Number.isFinite(plane.squareTransit[i]!)) transit[i] = plane.squareTransit[i]!;
    return { t, td, transit, pBoot, np, plane };
  };

  const unwrap = (raw: number): number => {
    // 48-bit device ticks wrap after 2^48 (203 days at 16 MHz); a jump back by more than half the range is a wrap.
    if (lastRaw >= 0 && raw < lastRaw - TWO48 / 2) wrapBase += TWO48;
    lastRaw = raw;
    return raw + wrapBase;
  };

  const data = (hostUs: number, line: string): void => {
    const pb = ensureBuilder();
    const r = decodeDeviceLine(line);
    if (!r.ok) {
      if (r.reason === 'bad-crc') c.crc++;
      else c.bad++;
      rejections[r.reason] = (rejections[r.reason] ?? 0) + 1;
      rejectedSinceGood++;
      return;
    }
    const rec = r.record;
    const tr = tracker.push(rec);
    if (tr.newBoot) {
      pb.newBoot();
      builderB?.newBoot();
      boot = tr.bootIndex;
      wrapBase = 0;
      lastRaw = -1;
      if (rec.kind === 'H') hzNow = rec.hz;
      else if (!sawHello) warnings.push(`boot ${boot} started without a hello: assuming ${hzNow} ticks/s`);
      bootHz[boot] = hzNow;
      bootLost[boot] = 0;
    } else if (tr.lostBefore > 0) {
      c.lost += Math.max(0, tr.lostBefore - rejectedSinceGood);
      pb.linesLost();
      builderB?.linesLost();
    } else if (rejectedSinceGood > 0) pb.linesLost(), builderB?.linesLost();
    rejectedSinceGood = 0;
    switch (rec.kind) {
      case 'H':
        sawHello = true;
        hello = { fw: rec.fw, mcu: rec.mcu, hz: rec.hz, ch: rec.ch, proto: rec.proto, boot: rec.boot.toString(16).padStart(4, '0') };
        if (rec.hz !== bootHz[boot]) bootHz[boot] = hzNow = rec.hz;
        return;
      case 'E': {
        const ticks = unwrap(rec.ticks);
        if (!bootFirst[boot]) bootFirst[boot] = { hostUs, ticks };
        const rig = rigNow();
        const ch = rig ? rig.beams[0].channel : 0;
        if (rec.ch === ch) {
          const blocks = (rig?.blocked_level ?? 'low') === 'low' ? rec.edge === 'f' : rec.edge === 'r';
          if (blocks) pb.blockStart(boot, ticks);
          else pb.blockEnd(boot, ticks, hostUs);
        } else if (builderB && rec.ch === rig!.beams[1]?.channel) {
          const blocks = rig!.blocked_level === 'low' ? rec.edge === 'f' : rec.edge === 'r';
          if (blocks) builderB.blockStart(boot, ticks);
          else builderB.blockEnd(boot, ticks, hostUs);
        } else if (rec.ch === ppsCh && rec.edge === 'r' && !rig?.beams?.some((b) => b.channel === ppsCh)) {
          pps.boot.push(boot);
          pps.ticks.push(ticks);
        } else c.otherEdges++;
        return;
      }
      case 'A':
        // The room changes over minutes: the line's arrival time places the reading well enough.
        room.push({ t_s: hostUs / 1e6, tempC: rec.temp / 100, pressPa: rec.press, rhPct: rec.hum / 1000 });
        return;
      case 'T': {
        const ticks = unwrap(rec.ticks);
        if (!bootFirst[boot]) bootFirst[boot] = { hostUs, ticks };
        hb.boot.push(boot);
        hb.ticks.push(ticks);
        hb.hostUs.push(hostUs);
        bootLost[boot] = Math.max(bootLost[boot] ?? 0, rec.lost);
        levels = rec.levels;
        lastBeatHostUs = hostUs;
        pb.advance(boot, ticks);
        builderB?.advance(boot, ticks);
        return;
      }
      default:
        return;
    }
  };

  const counts = (extra: Partial<RunCounts> = {}): RunCounts => {
    const tt = tracker.totals();
    const e = builder?.counts ?? { glitches: 0, bounces: 0, resyncs: 0 };
    return {
      crc_errors: c.crc,
      bad_lines: c.bad,
      lines_lost: c.lost,
      device_lost: bootLost.reduce((s, v) => s + (v ?? 0), 0),
      rejected_passes: 0,
      bridged_gaps: 0,
      reboots: tt.reboots,
      disconnects: c.disconnects,
      unknown_kinds: tt.unknownKinds,
      glitches: e.glitches,
      bounces: e.bounces,
      edge_resyncs: e.resyncs,
      unsequenced_passes: 0,
      long_gaps: 0,
      malformed_journal_lines: c.malformed,
      ...extra,
    };
  };

  return {
    push(entry: JournalEntry): void {
      switch (entry.kind) {
        case 'data':
          lastHostUs = entry.hostUs;
          data(entry.hostUs, entry.line);
          return;
        case 'annotation':
          lastHostUs = entry.hostUs;
          if (entry.word === 'disconnect') c.disconnects++;
          return;
        case 'start':
          if (startIso === null) startIso = entry.iso;
          return;
        case 'source':
          if (source === null) source = entry.text;
          return;
        case 'rig':
          if (!opts.rig && !journalRig) {
            const r = parseRig(entry.json);
            if (r.ok) (journalRig = swingView(r.rig)), (journalFileRig = r.rig);
            else warnings.push(`the journal's #rig line is not usable (${r.error}); give --rig FILE`);
          }
          return;
        case 'malformed':
          c.malformed++;
          return;
        default:
          return;
      }
    },

    live(nowHostUs?: number): LiveState {
      const now = nowHostUs ?? lastHostUs;
      const rig = rigNow();
      for (let k = recent.amp.length - 1; k >= 0 && recent.amp[k] === undefined; k--) recent.amp[k] = rig ? liveAmplitude(rig, recent.transit[k]!, recent.period[k]!) : null;
      const liveAmp = recent.amp.length ? (recent.amp[recent.amp.length - 1] ?? null) : null;
      return {
        hello,
        bootIndex: boot,
        lastHostUs,
        heartbeatAgeS: lastBeatHostUs !== null && now !== null ? (now - lastBeatHostUs) / 1e6 : null,
        levels,
        blocked: builder?.blocked ?? false,
        passes: builder?.passes.length ?? 0,
        halfPeriodsS: liveHalf,
        periodS: livePeriod,
        transitS: liveTransit,
        amplitudeDeg: liveAmp,
        meanPeriodS: meanN ? meanSum / meanN : null,
        meanPeriodCount: meanN,
        counts: counts(),
        lineRejections: { ...rejections },
        recent: { t_s: [...recent.t], period_s: [...recent.period], amplitude_deg: recent.amp.map((a) => a ?? null), transit_s: [...recent.transit] },
      };
    },

    result(ro: { rows?: boolean } = {}): AnalysisResult {
      const w = [...warnings];
      if (c.malformed > 0) w.push(`${c.malformed} journal line(s) were not in journal format and were skipped`);
      const rig = rigNow();
      const nb = Math.max(0, boot + 1);
      // Heartbeats and PPS pulses per boot, in device seconds (nominal) and host seconds.
      const beats: BootHeartbeats[] = [];
      const pulses: BootPps[] = [];
      const hbB = hb.boot.view();
      const ppsB = pps.boot.view();
      for (let b = 0; b < nb; b++) {
        const hz = bootHz[b] ?? hzNow;
        const dev: number[] = [];
        const host: number[] = [];
        for (let i = 0; i < hbB.length; i++) if (hbB[i] === b) dev.push(hb.ticks.at(i) / hz), host.push(hb.hostUs.at(i) / 1e6);
        beats.push({ boot: b, deviceS: dev, hostS: host });
        const pt: number[] = [];
        for (let i = 0; i < ppsB.length; i++) if (ppsB[i] === b) pt.push(pps.ticks.at(i));
        pulses.push({ boot: b, ticks: pt });
      }
      const clock = chooseClock(opts.clock, beats, pulses, bootHz[0] ?? hzNow, w);
      // A foreign timebase is not joined on the host clock: each boot starts at its first line (passColumns' fallback).
      const offsets = clock.foreign_rate === undefined ? bootOffsets(beats, clock.ppm) : new Map<number, number>();
      const k = 1 + clock.ppm * 1e-6;
      const { t, td, transit, pBoot, np, plane } = passColumns(k, offsets, rig);
      const seq = sequencePasses(t, transit, pBoot, opts.sequencing);
      if (seq.rejectedTransit > 0)
        w.push(`${seq.rejectedTransit} pass(es) rejected: transit time unlike the neighbours' (an object through the beam?)`);
      if (seq.rejectedTiming > 0) w.push(`${seq.rejectedTiming} pass(es) rejected: off the beat of the swing (an object through the beam?)`);
      if (seq.longGaps > 0) w.push(`${seq.longGaps} gap(s) too long to bridge: the run is analysed in ${seq.segments} segments`);
      const risk = rig && !builderB && np > 1 ? oneBeamPlaneRisk(t[np - 1]! - t[0]!, rig.latitude_deg) : null;
      if (risk) w.push(oneBeamPlaneText(risk));
      let unsequenced = 0;
      for (let i = 0; i < np; i++) if (seq.status[i] === STATUS_CODE.unsequenced) unsequenced++;
      if (unsequenced > 0) w.push(`${unsequenced} pass(es) left out: the swing no longer cleared the beam, or too few passes in a row to follow the beat`);
      const lastUs = lastHostUs ?? 0;
      return analyzeRun({
        rig,
        passes: { t, td, transit, index: seq.index, segment: seq.segment, status: seq.status, bridgedBefore: seq.bridgedBefore },
        clock,
        counts: counts({
          rejected_passes: seq.rejectedTransit + seq.rejectedTiming,
          bridged_gaps: seq.bridgedGaps,
          unsequenced_passes: unsequenced,
          long_gaps: seq.longGaps,
        }),
        run: { start_iso: startIso, duration_s: lastUs / 1e6, source, firmware: hello?.fw ?? null, hz_nominal: bootHz[0] ?? (sawHello ? hzNow : null) },
        warnings: w,
        lineRejections: { ...rejections },
        room,
        plane,
        rows: ro.rows ?? true,
        settings: { glitch_s: glitchS || (opts.glitchS ?? defaultEdgeThresholdS(rig)), bounce_s: bounceS || (opts.bounceS ?? defaultEdgeThresholdS(rig)) },
        ...(opts.delayDifferenceU_s !== undefined ? { delayDifferenceU_s: opts.delayDifferenceU_s } : {}),
      });
    },

    restartEstimates(hostUs: number): void {
      restartUs = hostUs;
      meanSum = 0;
      meanN = 0;
    },

    rig: rigNow,
    journalRig: () => journalFileRig,
  };
}
