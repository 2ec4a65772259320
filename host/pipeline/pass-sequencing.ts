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

/** Numbers the passes of one run; `boot` splits segments, `t` are pass times (s) and `transit` transit times (s). */
export function sequencePasses(
  t: ArrayLike<number>,
  transit: ArrayLike<number>,
  boot: ArrayLike<number>,
  opts: SequencingOptions = {},
): PassSequence {
  const n = t.length;
  const ratio = opts.transitRatio ?? 1.6;
  const tol = opts.gridTol ?? 0.05;
  const maxBridge = opts.maxBridge ?? 3;
  const status = new Uint8Array(n);
  const index = new Int32Array(n).fill(-1);
  const segment = new Int32Array(n).fill(-1);
  const bridgedBefore = new Uint8Array(n);
  const scratch = new Float64Array(2 * NEIGHBOURS);
  let rejectedTransit = 0;

  // 0. The typical spacing of passes (a half-period), for telling slow passes of a dying swing from objects.
  const gaps: number[] = [];
  const step = Math.max(1, Math.floor(n / 4000));
  for (let i = 0; i + 1 < n; i += step) if (boot[i + 1] === boot[i]) gaps.push(t[i + 1]! - t[i]!);
  const sortedGaps = Float64Array.from(gaps).sort();
  const spacing = gaps.length ? sortedGaps[gaps.length >> 1]! : Infinity;

  // 1. Transit against the neighbours of the same boot (not for slow passes, whose transit changes fast anyway).
  for (let i = 0; i < n; i++) {
    if (transit[i]! > spacing / 3) continue;
    let m = 0;
    for (let j = i - 1; j >= 0 && j >= i - NEIGHBOURS && boot[j] === boot[i]; j--) scratch[m++] = transit[j]!;
    for (let j = i + 1; j < n && j <= i + NEIGHBOURS && boot[j] === boot[i]; j++) scratch[m++] = transit[j]!;
    if (m < 3) continue;
    const med = sortedMedian(scratch, m);
    const r = transit[i]! / med;
    if (!(r < ratio && r > 1 / ratio)) (status[i] = REJECTED_TRANSIT), rejectedTransit++;
  }

  // 2. The beat of half-periods.
  let rejectedTiming = 0;
  let bridgedGaps = 0;
  let longGaps = 0;
  let seg = -1;
  // Recent half-periods by the parity of the pass that starts them (a gate offset makes them alternate).
  const hist = [new Float64Array(RING), new Float64Array(RING)] as const;
  const histN = [0, 0];
  const histAt = [0, 0];
  const hPar = [NaN, NaN];
  const histBuf = new Float64Array(RING);
  let H = NaN;
  const remember = (parity: number, h: number): void => {
    hist[parity]![histAt[parity]!] = h;
    histAt[parity] = (histAt[parity]! + 1) % RING;
    histN[parity] = Math.min(histN[parity]! + 1, RING);
    for (let q = 0; q < histN[parity]!; q++) histBuf[q] = hist[parity]![q]!;
    hPar[parity] = sortedMedian(histBuf, histN[parity]!);
    H = 0.5 * (hPar[0]! + hPar[1]!);
  };
  let last = -1;
  const candidates = (from: number): number => {
    let j = from;
    while (j < n && status[j] !== VALID) j++;
    return j;
  };
  const reject = (j: number): void => {
    status[j] = REJECTED_TIMING;
    rejectedTiming++;
  };
  const startSegment = (from: number): number => {
    // Find three consecutive candidates of the same boot, evenly spaced: a trustworthy start of the beat.
    // Candidates skipped on the way are left unsequenced, not rejected.
    let a = candidates(from);
    while (a < n) {
      const b = candidates(a + 1);
      const c = b < n ? candidates(b + 1) : n;
      if (c >= n || boot[b] !== boot[a] || boot[c] !== boot[a]) {
        status[a] = UNSEQUENCED;
        a = candidates(a + 1);
        continue;
      }
      const h1 = t[b]! - t[a]!;
      const h2 = t[c]! - t[b]!;
      if (transit[a]! > NOT_CLEARING * Math.min(h1, h2)) {
        status[a] = UNSEQUENCED;
        a = candidates(a + 1);
        continue;
      }
      if (h1 > 0 && h2 > 0 && h1 / h2 < 1.25 && h2 / h1 < 1.25) {
        seg++;
        index[a] = 0;
        segment[a] = seg;
        histN[0] = histN[1] = histAt[0] = histAt[1] = 0;
        remember(0, h1);
        remember(1, h2);
        last = a;
        return a + 1;
      }
      // Uneven spacing before a beat is known: a missing pass as likely as an intruder, so no blame.
      status[a] = UNSEQUENCED;
      a = candidates(a + 1);
    }
    last = -1;
    return n;
  };

  let j = startSegment(0);
  while (j < n) {
    j = candidates(j);
    if (j >= n) break;
    if (boot[j] !== boot[last]) {
      j = startSegment(j);
      continue;
    }
    if (transit[j]! > NOT_CLEARING * H) {
      status[j] = UNSEQUENCED;
      j++;
      continue;
    }
    const nBeats = (t[j]! - t[last]!) / H;
    if (nBeats > maxBridge + 0.5) {
      longGaps++;
      j = startSegment(j);
      continue;
    }
    const r = Math.round(nBeats);
    if (r < 1) {
      reject(j);
      j++;
      continue;
    }
    // All candidates in this beat window compete; the best fit to the predicted time and transit wins.
    let predicted = t[last]!;
    for (let q = 0; q < r; q++) predicted += hPar[(index[last]! + q) % 2]!;
    let best = -1;
    let bestScore = Infinity;
    let k = j;
    for (; k < n && boot[k] === boot[last] && t[k]! < predicted + 0.5 * H; k = candidates(k + 1)) {
      const score = Math.abs(t[k]! - predicted) / H + Math.abs(Math.log(transit[k]! / transit[last]!));
      if (score < bestScore) (bestScore = score), (best = k);
    }
    for (let q = j; q < k; q = candidates(q + 1)) if (q !== best) reject(q);
    if (best < 0) {
      j = k;
      continue;
    }
    if (Math.abs(t[best]! - predicted) > tol * H) {
      reject(best);
      j = k;
      continue;
    }
    if (r === 1) remember(index[last]! % 2, t[best]! - t[last]!);
    index[best] = index[last]! + r;
    segment[best] = seg;
    if (r > 1) (bridgedBefore[best] = r - 1), bridgedGaps++;
    last = best;
    j = k;
  }
  return { status, index, segment, bridgedBefore, rejectedTransit, rejectedTiming, bridgedGaps, longGaps, segments: seg + 1 };
}
