// The device's tick counter: a nominal frequency with a fixed error (ppm) and a slow drift (ppm per hour).

/**
 * f(t) = hz·(1 + 1e-6·(ppm + drift·t/3600)), t in host seconds since #start (the oscillator's drift runs on
 * across reboots). Ticks of a boot at host time b with fractional phase φ: hz·∫_b^t f/hz + φ.
 */
export class DeviceClock {
  private readonly p: number;
  private readonly d: number;

  constructor(
    readonly hz: number,
    ppm: number,
    driftPpmPerH: number,
    readonly bootT: number,
    readonly phase: number,
  ) {
    this.p = 1 + ppm * 1e-6;
    this.d = (driftPpmPerH * 1e-6) / 7200;
  }

  /** Fractional tick count at host time t (exact to ~1e-3 tick for a week at 16 MHz). */
  ticksAt(t: number): number {
    const u = t - this.bootT;
    return this.hz * (u * this.p + this.d * u * (t + this.bootT)) + this.phase;
  }

  /** The host time at which the counter reaches n (Newton on ticksAt, which is nearly linear). */
  timeAt(n: number): number {
    let t = this.bootT + (n - this.phase) / (this.hz * this.p);
    for (let i = 0; i < 3; i++) {
      const rate = this.hz * (this.p + 2 * this.d * t);
      t -= (this.ticksAt(t) - n) / rate;
    }
    return t;
  }
}
