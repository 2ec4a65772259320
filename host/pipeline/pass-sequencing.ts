// Raw passes → numbered passes: rejects passes that do not belong to the swing, and bridges missing ones.
//
// A pass is rejected when its transit time is unlike its neighbours' (something else crossed the beam, or it
// merged with the bob's own transit), or when it falls off the swing's beat of half-periods. The beat is followed
// with running medians of recent half-periods of each parity (a gate offset makes them alternate): a pass about
// r half-periods after the last accepted one (r = 1, 2, 3, within ±5 % of a half-period) is accepted as r passes
// later, so one or two missing passes are bridged and the pass numbering keeps the direction of travel (even
// numbers one way, odd the other). When several candidates fall in the same beat
// window the one nearest the predicted time (and transit) wins. A longer gap, or a new boot, starts a new segment.

import { STATUS_CODE } from '../analysis/passes.ts';

const { valid: VALID, 'rejected-transit': REJECTED_TRANSIT, 'rejected-timing': REJECTED_TIMING, unsequenced: UNSEQUENCED } = STATUS_CODE;

/** Result of sequencing, parallel to the input passes. */
export interface PassSequence {
  /** STATUS_CODE of each pass (host/analysis/passes.ts: read it with `passStatus`). */
  readonly status: Uint8Array;
  /** Pass number within its segment (−1 when rejected). */
  readonly index: Int32Array;
  /** Segment number (−1 when rejected). */
  readonly segment: Int32Array;
  /** Missing passes bridged just before this one. */
  readonly bridgedBefore: Uint8Array;
  readonly rejectedTransit: number;
  readonly rejectedTiming: number;
  /** Gaps of 1 or 2 missing passes that were bridged. */
  readonly bridgedGaps: number;
  /** Gaps too long to bridge (they start a new segment). */
  readonly longGaps: number;
  readonly segments: number;
}

/** Tunables of the sequencing. */
export interface SequencingOptions {
  /** A transit more than this factor off the neighbours' median is rejected (default 1.6). */
  readonly transitRatio?: number;
  /** Beat tolerance as a fraction of the half-period (default 0.05: the prediction follows each parity, so a real
   * pass lands within a few µs to ms of it; 5 % still allows for fast decay at large amplitude). */
  readonly gridTol?: number;
  /** Longest gap bridged, in half-periods (default 3, i.e. two missing passes). */
  readonly maxBridge?: number;
}

const NEIGHBOURS = 6;
/** Half-periods remembered per parity for the beat prediction. */
const RING = 5;
/**
 * A pass blocked for more than this fraction of a half-period belongs to a swing that no longer clears the beam
 * well (at the end of a decay, or on one side of an offset beam): left out without blame.
 */
const NOT_CLEARING = 0.6;

function sortedMedian(buf: Float64Array, n: number): number {
  for (let i = 1; i < n; i++) {
    const v = buf[i]!;
    let j = i - 1;
    while (j >= 0 && buf[j]! > v) (buf[j + 1] = buf[j]!), j--;
    buf[j + 1] = v;
  }
  return n % 2 ? buf[n >> 1]! : 0.5 * (buf[(n >> 1) - 1]! + buf[n >> 1]!);
}

/** The beat of half-periods: running medians of the recent ones of each parity (a gate offset makes them alternate). */
class Beat {
  private readonly hist = [new Float64Array(RING), new Float64Array(RING)] as const;
  private readonly histN = [0, 0];
  private readonly histAt = [0, 0];
  private readonly buf = new Float64Array(RING);
  /** Median half-period starting at a pass of each parity, and their mean H. */
  readonly hPar = [NaN, NaN];
  H = NaN;

  /** Forgets the history (a new segment). */
  reset(): void {
    this.histN[0] = this.histN[1] = this.histAt[0] = this.histAt[1] = 0;
  }

  /** A measured half-period starting at a pass of `parity`. */
  remember(parity: number, h: number): void {
    this.hist[parity]![this.histAt[parity]!] = h;
    this.histAt[parity] = (this.histAt[parity]! + 1) % RING;
    this.histN[parity] = Math.min(this.histN[parity]! + 1, RING);
    for (let q = 0; q < this.histN[parity]!; q++) this.buf[q] = this.hist[parity]![q]!;
    this.hPar[parity] = sortedMedian(this.buf, this.histN[parity]!);
    this.H = 0.5 * (this.hPar[0]! + this.hPar[1]!);
  }
}

/** The typical spacing of passes (a half-period), for telling slow passes of a dying swing from objects. */
function typicalSpacing(t: ArrayLike<number>, boot: ArrayLike<number>): number {
  const n = t.length;
  const gaps: number[] = [];
  const step = Math.max(1, Math.floor(n / 4000));
  for (let i = 0; i + 1 < n; i += step) if (boot[i + 1] === boot[i]) gaps.push(t[i + 1]! - t[i]!);
  const sortedGaps = Float64Array.from(gaps).sort();
  return gaps.length ? sortedGaps[gaps.length >> 1]! : Infinity;
}

/** Marks passes whose transit is unlike their neighbours' of the same boot (not slow passes, whose transit changes fast anyway). */
function rejectByTransit(transit: ArrayLike<number>, boot: ArrayLike<number>, spacing: number, ratio: number, status: Uint8Array): number {
  const n = transit.length;
  const scratch = new Float64Array(2 * NEIGHBOURS);
  let rejected = 0;
  for (let i = 0; i < n; i++) {
    if (transit[i]! > spacing / 3) continue;
    let m = 0;
    for (let j = i - 1; j >= 0 && j >= i - NEIGHBOURS && boot[j] === boot[i]; j--) scratch[m++] = transit[j]!;
    for (let j = i + 1; j < n && j <= i + NEIGHBOURS && boot[j] === boot[i]; j++) scratch[m++] = transit[j]!;
    if (m < 3) continue;
    const r = transit[i]! / sortedMedian(scratch, m);
    if (!(r < ratio && r > 1 / ratio)) (status[i] = REJECTED_TRANSIT), rejected++;
  }
  return rejected;
}

/** Follows the beat through the passes left after the transit check, numbering them segment by segment. */
class BeatFollower {
  readonly index: Int32Array;
  readonly segment: Int32Array;
  readonly bridgedBefore: Uint8Array;
  rejectedTiming = 0;
  bridgedGaps = 0;
  longGaps = 0;
  seg = -1;
  private last = -1;
  private readonly beat = new Beat();
  private readonly n: number;

  constructor(
    private readonly t: ArrayLike<number>,
    private readonly transit: ArrayLike<number>,
    private readonly boot: ArrayLike<number>,
    private readonly status: Uint8Array,
    private readonly tol: number,
    private readonly maxBridge: number,
  ) {
    this.n = t.length;
    this.index = new Int32Array(this.n).fill(-1);
    this.segment = new Int32Array(this.n).fill(-1);
    this.bridgedBefore = new Uint8Array(this.n);
  }

  /** The first pass from `from` on that is still a candidate (valid so far). */
  private candidates(from: number): number {
    let j = from;
    while (j < this.n && this.status[j] !== VALID) j++;
    return j;
  }

  private reject(j: number): void {
    this.status[j] = REJECTED_TIMING;
    this.rejectedTiming++;
  }

  /**
   * Finds three consecutive candidates of the same boot, evenly spaced: a trustworthy start of the beat. Candidates
   * skipped on the way are left unsequenced, not rejected. Returns where to go on.
   */
  private startSegment(from: number): number {
    const { t, transit, boot, status } = this;
    for (let a = this.candidates(from); a < this.n; a = this.candidates(a + 1)) {
      const b = this.candidates(a + 1);
      const c = b < this.n ? this.candidates(b + 1) : this.n;
      if (c >= this.n || boot[b] !== boot[a] || boot[c] !== boot[a]) {
        status[a] = UNSEQUENCED;
        continue;
      }
      const h1 = t[b]! - t[a]!;
      const h2 = t[c]! - t[b]!;
      // Uneven spacing before a beat is known: a missing pass as likely as an intruder, so no blame.
      if (transit[a]! > NOT_CLEARING * Math.min(h1, h2) || !(h1 > 0 && h2 > 0 && h1 / h2 < 1.25 && h2 / h1 < 1.25)) {
        status[a] = UNSEQUENCED;
        continue;
      }
      this.seg++;
      this.index[a] = 0;
      this.segment[a] = this.seg;
      this.beat.reset();
      this.beat.remember(0, h1);
      this.beat.remember(1, h2);
      this.last = a;
      return a + 1;
    }
    this.last = -1;
    return this.n;
  }

  /** All candidates in the beat window of candidate `j` compete; the best fit to the predicted time and transit wins. Returns where to go on. */
  private window(j: number, r: number): number {
    const { t, transit, boot, beat } = this;
    const last = this.last;
    let predicted = t[last]!;
    for (let q = 0; q < r; q++) predicted += beat.hPar[(this.index[last]! + q) % 2]!;
    let best = -1;
    let bestScore = Infinity;
    let k = j;
    for (; k < this.n && boot[k] === boot[last] && t[k]! < predicted + 0.5 * beat.H; k = this.candidates(k + 1)) {
      const score = Math.abs(t[k]! - predicted) / beat.H + Math.abs(Math.log(transit[k]! / transit[last]!));
      if (score < bestScore) (bestScore = score), (best = k);
    }
    for (let q = j; q < k; q = this.candidates(q + 1)) if (q !== best) this.reject(q);
    if (best < 0) return k;
    if (Math.abs(t[best]! - predicted) > this.tol * beat.H) {
      this.reject(best);
      return k;
    }
    if (r === 1) beat.remember(this.index[last]! % 2, t[best]! - t[last]!);
    this.index[best] = this.index[last]! + r;
    this.segment[best] = this.seg;
    if (r > 1) (this.bridgedBefore[best] = r - 1), this.bridgedGaps++;
    this.last = best;
    return k;
  }

  /** Follows the beat over every candidate. */
  run(): void {
    let j = this.startSegment(0);
    while (j < this.n) {
      j = this.candidates(j);
      if (j >= this.n) break;
      if (this.boot[j] !== this.boot[this.last]) {
        j = this.startSegment(j);
        continue;
      }
      if (this.transit[j]! > NOT_CLEARING * this.beat.H) {
        this.status[j] = UNSEQUENCED;
        j++;
        continue;
      }
      const nBeats = (this.t[j]! - this.t[this.last]!) / this.beat.H;
      if (nBeats > this.maxBridge + 0.5) {
        this.longGaps++;
        j = this.startSegment(j);
        continue;
      }
      const r = Math.round(nBeats);
      if (r < 1) {
        this.reject(j);
        j++;
        continue;
      }
      j = this.window(j, r);
    }
  }
}

/** Numbers the passes of one run; `boot` splits segments, `t` are pass times (s) and `transit` transit times (s). */
export function sequencePasses(
  t: ArrayLike<number>,
  transit: ArrayLike<number>,
  boot: ArrayLike<number>,
  opts: SequencingOptions = {},
): PassSequence {
  const status = new Uint8Array(t.length);
  const rejectedTransit = rejectByTransit(transit, boot, typicalSpacing(t, boot), opts.transitRatio ?? 1.6, status);
  const f = new BeatFollower(t, transit, boot, status, opts.gridTol ?? 0.05, opts.maxBridge ?? 3);
  f.run();
  return {
    status,
    index: f.index,
    segment: f.segment,
    bridgedBefore: f.bridgedBefore,
    rejectedTransit,
    rejectedTiming: f.rejectedTiming,
    bridgedGaps: f.bridgedGaps,
    longGaps: f.longGaps,
    segments: f.seg + 1,
  };
}
