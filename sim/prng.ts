// Seeded pseudo-random numbers for the simulator: xoshiro128** seeded through SplitMix64, with named substreams.
//
// Algorithm: xoshiro128** 1.1 of D. Blackman and S. Vigna, "Scrambled Linear Pseudorandom Number Generators",
// ACM Trans. Math. Softw. 47(4), 36 (2021); reference C code at prng.di.unimi.it (xoshiro128starstar.c).
// The state is filled from SplitMix64 as those authors recommend. Each concern (jitter, USB latency,
// faults...) draws from its own substream, so turning one fault on does not shift the draws of another.

const MASK64 = (1n << 64n) - 1n;

function splitmix64(state: { s: bigint }): bigint {
  state.s = (state.s + 0x9e3779b97f4a7c15n) & MASK64;
  let z = state.s;
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
  return z ^ (z >> 31n);
}

/** FNV-1a (32-bit) of a label, to derive substream seeds. */
function fnv1a(label: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;
  private spare: number | undefined;

  /** `seed` is any safe integer; `stream` names an independent substream. */
  constructor(
    readonly seed: number,
    readonly stream = '',
  ) {
    const st = { s: (BigInt.asUintN(64, BigInt(Math.trunc(seed))) ^ (BigInt(fnv1a(stream)) << 32n)) & MASK64 };
    const x = splitmix64(st);
    const y = splitmix64(st);
    this.a = Number(x & 0xffffffffn);
    this.b = Number(x >> 32n);
    this.c = Number(y & 0xffffffffn);
    this.d = Number(y >> 32n);
    if ((this.a | this.b | this.c | this.d) === 0) this.a = 1; // the all-zero state is the one forbidden state
  }

  /** An independent generator for another concern, from the same seed. */
  fork(stream: string): Rng {
    return new Rng(this.seed, this.stream ? `${this.stream}/${stream}` : stream);
  }

  /** Next 32-bit unsigned integer. */
  nextU32(): number {
    const result = Math.imul(rotl(Math.imul(this.b, 5), 7), 9) >>> 0;
    const t = this.b << 9;
    this.c ^= this.a;
    this.d ^= this.b;
    this.b ^= this.c;
    this.a ^= this.d;
    this.c ^= t;
    this.d = rotl(this.d, 11);
    return result;
  }

  /** Uniform on [0, 1) with 53 random bits. */
  uniform(): number {
    const hi = this.nextU32() >>> 5;
    const lo = this.nextU32() >>> 6;
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform on [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.uniform();
  }

  /** Uniform integer in [lo, hi], both included. */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.uniform() * (hi - lo + 1));
  }

  /** True with probability p. */
  chance(p: number): boolean {
    return p > 0 && this.uniform() < p;
  }

  /** Standard normal (Box–Muller, polar form). */
  normal(): number {
    if (this.spare !== undefined) {
      const s = this.spare;
      this.spare = undefined;
      return s;
    }
    let u: number, v: number, s: number;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.spare = v * f;
    return u * f;
  }

  /** Exponential with the given mean. */
  exponential(mean: number): number {
    return -Math.log(1 - this.uniform()) * mean;
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
