// The device's tick counter: a nominal frequency with a fixed error (ppm), a slow drift (ppm per hour) and,
// optionally, a rate that follows the board's temperature (a resonator's temperature coefficient).

/** A fractional rate offset over host time (e.g. a temperature coefficient times the room's swing) and its integral. */
export interface RateExcursion {
  /** Fractional rate offset at host time t (1e-6 = 1 ppm). */
  rate(t: number): number;
  /** ∫₀ᵗ rate, s. */
  integral(t: number): number;
}

/**
 * f(t) = hz·(1 + 1e-6·(ppm + drift·t/3600) + e(t)), t in host seconds since #start (the oscillator's drift runs on
 * across reboots), e the optional excursion. Ticks of a boot at host time b with fractional phase φ: hz·∫_b^t f/hz + φ.
 */
export class DeviceClock {
  private readonly p: number;
  private readonly d: number;
  private readonly eb: number;

  constructor(
    readonly hz: number,
    ppm: number,
    driftPpmPerH: number,
    readonly bootT: number,
    readonly phase: number,
    private readonly excursion?: RateExcursion,
  ) {
    this.p = 1 + ppm * 1e-6;
    this.d = (driftPpmPerH * 1e-6) / 7200;
    this.eb = excursion ? excursion.integral(bootT) : 0;
  }

  /** Fractional tick count at host time t (exact to ~1e-3 tick for a week at 16 MHz). */
  ticksAt(t: number): number {
    const u = t - this.bootT;
    const e = this.excursion ? this.excursion.integral(t) - this.eb : 0;
    return this.hz * (u * this.p + this.d * u * (t + this.bootT) + e) + this.phase;
  }

  /** The host time at which the counter reaches n (Newton on ticksAt, which is nearly linear). */
  timeAt(n: number): number {
    let t = this.bootT + (n - this.phase) / (this.hz * this.p);
    for (let i = 0; i < 3; i++) {
      const rate = this.hz * (this.p + 2 * this.d * t + (this.excursion ? this.excursion.rate(t) : 0));
      t -= (this.ticksAt(t) - n) / rate;
    }
    return t;
  }
}
