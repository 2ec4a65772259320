// Host clock for journal timestamps: monotonic integer microseconds, immune to wall-clock steps (NTP, suspend).

/** A clock reading integer µs since the moment it was made. */
export type MicrosClock = () => number;

/** A monotonic clock starting at 0 now (process.hrtime, not Date.now, so NTP steps never reorder lines). */
export function monotonicClock(): MicrosClock {
  const t0 = process.hrtime.bigint();
  return () => Number((process.hrtime.bigint() - t0) / 1000n);
}
