// The harness itself: silicon write-one-to-clear semantics for TIFR0..2 (simavr 1.6 clears every flag)
// and EIFR (simavr 1.6 stores the written value), and why it matters for the firmware.
import { expect, it } from 'vitest';
import { EMULATOR_HZ, runFirmware } from '../../sim/emulator/run-firmware.ts';
import { REPO_ROOT } from '../../sim/emulator/toolchain.ts';
import { decodeRun, latencies } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const PROBE = `${REPO_ROOT}sim/emulator/build/tifr-probe.elf`;

describeFirmware('simavr harness', () => {
  // Silicon: "the flag is cleared by writing a logic one to its bit location" (ATmega328P datasheet, TIFRn
  // register descriptions); writing TIFRn = _BV(OCFnA) must leave a pending TOVn set.
  it('restores write-one-to-clear on TIFR0, TIFR1, TIFR2 and EIFR', async () => {
    const run = await runFirmware({ edges: [], durationS: 0.01, elfPath: PROBE });
    expect(run.lines).toEqual(['t0 01', 't1 01', 't2 01', 'e 01']);
  });

  it('shows the simavr 1.6 behaviour without the fix, so the probe can tell', async () => {
    const run = await runFirmware({ edges: [], durationS: 0.01, elfPath: PROBE, tifrFix: false });
    // TIFRn: every flag cleared. EIFR: the written byte stored as is (INTF1 set, INTF0 gone, nothing cleared).
    expect(run.lines).toEqual(['t0 00', 't1 00', 't2 00', 'e 02']);
  });

  it('without the fix, a capture just after an overflow loses that overflow and later ticks fall 65536 short', async () => {
    const start = (await runFirmware({ edges: [], durationS: 0.05 })).timer1StartCycle;
    // Edges 20 cycles before an overflow: the capture ISR writes TIFR1 = _BV(ICF1) just after the overflow,
    // which in simavr 1.6 also wipes the pending TOV1.
    const edges = Array.from({ length: 20 }, (_, i) => {
      const at = start + (50 + 10 * i) * 65536 - 20;
      return { t_s: at / EMULATOR_HZ, ch: 0 as const, level: ((i + 1) % 2) as 0 | 1 };
    });
    const broken = await runFirmware({ edges, durationS: 1, tifrFix: false });
    const fixed = await runFirmware({ edges, durationS: 1 });
    const errBroken = latencies(broken, decodeRun(broken), 0);
    const errFixed = latencies(fixed, decodeRun(fixed), 0);
    expect(errFixed.every((e) => e === 0)).toBe(true);
    expect(errBroken.filter((e) => e !== 0).length).toBeGreaterThan(10);
    expect(errBroken.every((e) => e % 65536 === 0)).toBe(true);
  });

  it('records the cycle at which each change was applied and reports what the firmware programmed', async () => {
    const run = await runFirmware({ edges: [{ t_s: 0.1, ch: 0, level: 1 }], durationS: 0.2 });
    expect(run.applied).toHaveLength(1);
    expect(run.applied[0]!.cycle - 0.1 * EMULATOR_HZ).toBeGreaterThanOrEqual(0);
    expect(run.hz).toBe(16_000_000);
    expect(run.timer1StartCycle).toBeGreaterThan(0);
  });
});
