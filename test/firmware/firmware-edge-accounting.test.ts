// Edge accounting on ch0: for pulse trains of every spacing the firmware's physics allows it to judge, each
// applied edge either comes back exact (tick and polarity) or is counted in `lost`, never both, never neither.
import { expect, it } from 'vitest';
import { CH0_UNCOUNTED_PAIR_TICKS } from '../../protocol/link-defaults.ts';
import { EMULATOR_HZ, runFirmware, type FirmwareEdge, type RunFirmwareOptions } from '../../sim/emulator/run-firmware.ts';
import { decodeRun, edgesOf, heartbeatsOf, readingsEverySecond } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const GAPS = [5, 8, 10, 15, 20, 25, 30, 40, 60, 90, 130, 180, 250, 400];
/**
 * Shortest g1 + g2 swept in each setting. Idle: CH0_UNCOUNTED_PAIR_TICKS. While the main loop formats
 * lines its short interrupt-off sections and the UART interrupt delay the capture vector, and the
 * overflow ISR (34 cycles) does so by more: two edges inside that delay are the same physical hole, so
 * those settings start higher (measured: 60 and 70 add up; gaps of 10 + 10 near an overflow do not).
 */
const IDLE_PAIR = CH0_UNCOUNTED_PAIR_TICKS;
const BUSY_PAIR = 60;
const OVERFLOW_PAIR = 70;





/**
 * Trains of rise, fall, rise (gaps g1, g2), then a fall long after. Two edges closer together than
 * CH0_UNCOUNTED_PAIR_TICKS after a capture come before the vector can look, which no firmware can see
 * (see protocol/link-defaults.ts); those trains are left out, everything else must add up exactly.
 */
function trains(minPair: number, shortPairs = true): number[][] {
  const out: number[][] = [];
  for (const a of GAPS) for (const b of GAPS) if (a + b >= minPair || (shortPairs && a <= 10 && b <= 10)) out.push([a, b, 3000]);
  // Longer trains of six edges: all gaps past the handler's length, or short ones between them.
  for (const g of [180, 250, 400]) out.push([g, g, g, g, 3000], [g, 40, g, 40, 3000]);
  return out;
}

/** Lays the trains out from `first` (cycles), one every `slot` cycles, each starting at `offset(i)`. */
function schedule(minPair: number, shortPairs: boolean, first: number, slot: number, offset: (i: number) => number): { edges: FirmwareEdge[]; end: number } {
  const edges: FirmwareEdge[] = [];
  let end = 0;
  trains(minPair, shortPairs).forEach((gaps, i) => {
    let c = first + i * slot + offset(i);
    edges.push({ t_s: c / EMULATOR_HZ, ch: 0, level: 1 });
    gaps.forEach((g, k) => {
      c += g;
      edges.push({ t_s: c / EMULATOR_HZ, ch: 0, level: k % 2 === 0 ? 0 : 1 });
    });
    end = c;
  });
  return { edges, end };
}

/** Both channels share `lost`, so the count is over every applied change; the tick check is ch0's. */
async function check(edges: FirmwareEdge[], end: number, label: string, options: Partial<RunFirmwareOptions> = {}) {
  const run = await runFirmware({ edges, durationS: end / EMULATOR_HZ + 1.1, ...options });
  const records = decodeRun(run);
  const applied = run.applied.filter((a) => a.cycle > 0);
  const got = edgesOf(records);
  const lost = heartbeatsOf(records).at(-1)!.lost;
  console.log(`${label}: ${applied.length} edges applied, ${got.length} returned, ${lost} counted lost`);
  expect(got.length + lost).toBe(applied.length);
  // Every returned edge is a real one, exact to the tick, with its own polarity.
  const real = new Map(applied.filter((a) => a.ch === 0).map((a) => [a.cycle - run.timer1StartCycle, a.level ? 'r' : 'f']));
  for (const e of edgesOf(records, 0)) expect(real.get(e.ticks), `edge at ${e.ticks}`).toBe(e.edge);
  // The polarity stays in step: the last edge returned is the level the input ends at.
  expect(edgesOf(records, 0).at(-1)!.edge).toBe('f');
  return { got: got.length, lost };
}

describeFirmware('ch0 edge accounting: returned + lost = applied', () => {
  it('pulse trains with gaps of 5 to 400 cycles, CPU idle', async () => {
    const { edges, end } = schedule(IDLE_PAIR, true, Math.round(0.1 * EMULATOR_HZ), 80_000, () => 0);
    const { lost } = await check(edges, end, 'idle');
    expect(lost).toBeGreaterThan(0); // the sweep does reach the short-pulse limit
  });

  it('the same trains starting from 30 cycles before to 30 after a timer overflow', async () => {
    const start = (await runFirmware({ edges: [], durationS: 0.05 })).timer1StartCycle;
    const { edges, end } = schedule(OVERFLOW_PAIR, false, start + 20 * 65536, 2 * 65536, (i) => (i % 61) - 30);
    await check(edges, end, 'overflows');
  });

  it('the same trains from 30 cycles before to 30 after the room sensor\'s compare-B wake-up, a reading every second', async () => {
    // Compare-B wakes the loop at each reading's due time (firmware/src/main.c arm_room_wake). Its vector ranks
    // below the capture vector and is shorter than the overflow's, so the overflow's trains must add up here too.
    const { options, start, due } = await readingsEverySecond();
    const { edges, end } = schedule(OVERFLOW_PAIR, false, start + due(4), EMULATOR_HZ, (i) => (i % 61) - 30);
    await check(edges, end, 'compare-B', options);
  }, 60_000);

  it('ch1: two changes after the vector was entered are counted, not merged into one edge', async () => {
    // Rise, fall, rise with the fall and the second rise 20-30 cycles after the first: both come while the
    // handler runs, after its entry cleared INTF0. The handler reads INTF0 again before the level: set, with
    // the level moved, means the first edge plus two unseen ones. Closer triples (within the few cycles
    // before the vector's entry) and a change on the single cycle between those two reads stay the hole
    // firmware/README.md states, so this checks the case the handler is built to catch.
    const triples = [[20, 20], [20, 30], [30, 20], [25, 25], [22, 24]] as const;
    const edges: FirmwareEdge[] = [];
    triples.forEach(([a, b], i) => {
      const c = Math.round((0.2 + i * 0.05) * EMULATOR_HZ);
      for (const [dt, level] of [[0, 1], [a, 0], [a + b, 1], [a + b + 3000, 0]] as const) edges.push({ t_s: (c + dt) / EMULATOR_HZ, ch: 1, level });
    });
    const run = await runFirmware({ edges, durationS: 1.5 });
    const records = decodeRun(run);
    const got = edgesOf(records, 1);
    const lost = heartbeatsOf(records).at(-1)!.lost;
    const applied = run.applied.filter((a) => a.ch === 1 && a.cycle > 0).length;
    console.log(`ch1: ${applied} edges applied, ${got.length} returned, ${lost} counted lost`);
    expect(got.length + lost).toBe(applied);
    expect(got.map((e) => e.edge).join('')).toBe('rf'.repeat(triples.length));
  });

  it('the same trains while the main loop is busy formatting earlier edges', async () => {
    const first = Math.round(0.1 * EMULATOR_HZ);
    const { edges, end } = schedule(BUSY_PAIR, true, first, 160_000, () => 0);
    // Before each train, 6 ch1 edges 60 µs apart that end 1 ms before it: their lines are still being formatted.
    const load: FirmwareEdge[] = [];
    const n = trains(BUSY_PAIR).length;
    for (let i = 0; i < n; i++) {
      const t0 = first + i * 160_000 - 16_000 - 6 * 960;
      for (let k = 0; k < 6; k++) load.push({ t_s: (t0 + k * 960) / EMULATOR_HZ, ch: 1, level: (k % 2 === 0 ? 1 : 0) as 0 | 1 });
    }
    const { got } = await check([...edges, ...load.filter((e) => e.t_s > 0.05)], end, 'busy');
    expect(got).toBeGreaterThan(0);
  });
});
