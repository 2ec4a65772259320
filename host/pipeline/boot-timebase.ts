// Device ticks → seconds, per boot: the boot count, the 48-bit unwrap, each boot's nominal rate and its first anchor.
import type { Warning } from '../analysis/warning.ts';
import type { HelloRecord } from '../../protocol/records.ts';

const TWO48 = 2 ** 48;
/** The tick rate assumed until a hello says otherwise. */
const DEFAULT_HZ = 16_000_000;

/** Host-clock offset of each boot (s), from `bootOffsets` (host/analysis/clock-calibration.ts). */
export type BootOffsets = ReadonlyMap<number, number>;

/** The boots of one run and the state that turns each boot's ticks into seconds. */
export class BootTimebase {
  /** Index of the current boot: 0 for the first seen, −1 before any device line. */
  boot = -1;
  private hzNow = DEFAULT_HZ;
  private sawHello = false;
  private wrapBase = 0;
  private lastRaw = -1;
  private readonly bootHz: number[] = [];
  /** The first (host µs, unwrapped ticks) seen in each boot. */
  private readonly first: { hostUs: number; ticks: number }[] = [];

  /** Starts boot `index` with the hello's rate (or the last known one); a warning when it began without a hello. */
  newBoot(index: number, hello: HelloRecord | null): Warning | null {
    this.boot = index;
    this.wrapBase = 0;
    this.lastRaw = -1;
    if (hello) this.hzNow = hello.hz;
    this.bootHz[index] = this.hzNow;
    return hello || this.sawHello ? null : { kind: 'boot-without-hello', boot: index, hz: this.hzNow };
  }

  /** A hello within the current boot: its rate is the boot's. */
  hello(hz: number): void {
    this.sawHello = true;
    if (hz !== this.bootHz[this.boot]) this.bootHz[this.boot] = this.hzNow = hz;
  }

  /** 48-bit device ticks wrap after 2^48 (203 days at 16 MHz); a jump back by more than half the range is a wrap. */
  unwrap(raw: number): number {
    if (this.lastRaw >= 0 && raw < this.lastRaw - TWO48 / 2) this.wrapBase += TWO48;
    this.lastRaw = raw;
    return raw + this.wrapBase;
  }

  /** Unwraps a timed record's ticks and anchors the boot at its first one. */
  timed(hostUs: number, raw: number): number {
    const ticks = this.unwrap(raw);
    if (!this.first[this.boot]) this.first[this.boot] = { hostUs, ticks };
    return ticks;
  }

  /** Nominal ticks per second of boot `b`. */
  hz(b: number): number {
    return this.bootHz[b] ?? this.hzNow;
  }

  /** Boots seen so far. */
  get count(): number {
    return Math.max(0, this.boot + 1);
  }

  /** The first boot's rate, null before any hello or boot (the run's `hz_nominal`). */
  nominalHz(): number | null {
    return this.bootHz[0] ?? (this.sawHello ? this.hzNow : null);
  }

  /**
   * Ticks of a boot → seconds on the host-joined timebase, with the nominal rates scaled by `k` (1 + ppm·1e-6), or
   * through `since` (a tracked rate: seconds since the boot's tick 0): the boot's host offset when the clock fit gave
   * one, else its first anchor.
   */
  joiner(k: number, offsets: BootOffsets, since: ((b: number, ticks: number) => number) | null = null): (b: number, ticks: number) => number {
    if (since) return (b, ticks) => (offsets.get(b) ?? this.first[b]!.hostUs / 1e6 - since(b, this.first[b]!.ticks)) + since(b, ticks);
    return (b, ticks) => {
      const tps = this.hz(b) * k;
      const first = this.first[b]!;
      return (offsets.get(b) ?? first.hostUs / 1e6 - first.ticks / tps) + ticks / tps;
    };
  }
}
