// Same seed, same bytes; another seed, another run; memory and speed of long runs (printed, never asserted).
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { loadScenario, simulateJournal, truthJson } from '../../sim/index.ts';

function digest(name: string, seed: number, durationS: number): { journal: string; truth: string; lines: number } {
  const { lines, truth } = simulateJournal(loadScenario(name), { seed, durationS });
  const h = createHash('sha256');
  let n = 0;
  for (const l of lines) {
    h.update(`${l}\n`);
    n++;
  }
  return { journal: h.digest('hex'), truth: createHash('sha256').update(truthJson(truth)).digest('hex'), lines: n };
}

describe('determinism', () => {
  it('the same seed gives byte-identical journals and truth, with every fault kind on', () => {
    const a = digest('night-run-faults', 7, 11_000);
    const b = digest('night-run-faults', 7, 11_000);
    expect(a.lines).toBeGreaterThan(20_000);
    expect(b).toEqual(a);
  });

  it('another seed gives another journal', () => {
    expect(digest('demo-low-q', 1, 60).journal).not.toBe(digest('demo-low-q', 2, 60).journal);
  });
});

describe('long runs', () => {
  it('a 24-hour run streams with flat memory (figures printed, not asserted)', () => {
    // Lightly damped, so the bob still passes the gate after a day (the scenario's own damping stops it in ~3 h).
    const { lines, truth } = simulateJournal(loadScenario('brass-1m-two-hours'), {
      seed: 1,
      durationS: 86_400,
      linear_q: 200_000,
      quadratic_per_rad: 0,
      coulomb_rad: 0,
    });
    const heap0 = process.memoryUsage().heapUsed;
    const t0 = performance.now();
    let n = 0;
    let maxHeap = heap0;
    for (const _ of lines) {
      if (++n % 20_000 === 0) maxHeap = Math.max(maxHeap, process.memoryUsage().heapUsed);
    }
    const ms = performance.now() - t0;
    const periods = truth.swings.t_s.length * truth.swings.stride / 2;
    console.log(
      `sim 24 h run: ${n} lines, ~${Math.round(periods)} periods in ${(ms / 1000).toFixed(2)} s; heap +${((maxHeap - heap0) / 1e6).toFixed(1)} MB peak`,
    );
    expect(truth.complete).toBe(true);
    expect(n).toBeGreaterThan(86_400 + 80_000);
  });
});
