// A small seeded generator for tests: xorshift128+ (S. Vigna, "Further scramblings of Marsaglia's xorshift
// generators", J. Comput. Appl. Math. 315 (2017), from memory), with uniform, normal and exponential draws.
export class TestRng {
  private s0: bigint;
  private s1: bigint;
  constructor(seed: number) {
    this.s0 = BigInt(seed) * 0x9e3779b97f4a7c15n + 1n;
    this.s1 = (BigInt(seed) ^ 0xdeadbeefn) * 0xbf58476d1ce4e5b9n + 3n;
    for (let i = 0; i < 10; i++) this.uniform();
  }
  /** Uniform in [0, 1). */
  uniform(): number {
    const M = (1n << 64n) - 1n;
    let x = this.s0;
    const y = this.s1;
    this.s0 = y;
    x = (x ^ (x << 23n)) & M;
    this.s1 = x ^ y ^ (x >> 17n) ^ (y >> 26n);
    return Number(((this.s1 + y) & M) >> 11n) / 2 ** 53;
  }
  normal(): number {
    return Math.sqrt(-2 * Math.log(1 - this.uniform())) * Math.cos(2 * Math.PI * this.uniform());
  }
  exponential(mean: number): number {
    return -mean * Math.log(1 - this.uniform());
  }
}
