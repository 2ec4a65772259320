// Heartbeats from the tick counter, host commands and their replies, reset cause, watchdog and
// interrupt sources, as the real firmware does them in the emulator.
import { beforeAll, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import type { HelloRecord, ReplyRecord } from '../../protocol/records.ts';
import { DEFAULT_BAUD, DEFAULT_TICK_HZ } from '../../protocol/link-defaults.ts';
import { EMULATOR_HZ, runFirmware, type FirmwareRun } from '../../sim/emulator/run-firmware.ts';
import { decodeRun, edgesOf, heartbeatsOf } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const MS = DEFAULT_TICK_HZ / 1000;

describeFirmware('heartbeats', () => {
  let run: FirmwareRun;
  beforeAll(async () => {
    // Some input activity, so heartbeats have to share the CPU and the UART with edge lines.
    const edges = Array.from({ length: 400 }, (_, i) => ({ t_s: 0.5 + i * 0.0251, ch: (i % 4 < 2 ? 0 : 1) as 0 | 1, level: (i % 2 === 0 ? 1 : 0) as 0 | 1 }));
    run = await runFirmware({ edges, durationS: 12.2 });
  });

  it('come every 1000 ms ± 1 ms of device time, by their own ticks and by when they leave the UART', () => {
    const records = decodeRun(run);
    const beats = heartbeatsOf(records);
    expect(beats.length).toBe(12);
    const tickGaps = beats.slice(1).map((b, i) => b.ticks - beats[i]!.ticks);
    for (const g of tickGaps) expect(Math.abs(g - 1000 * MS)).toBeLessThanOrEqual(1 * MS);
    const sentAt = records.map((r, i) => (r.kind === 'T' ? run.lineCycles[i]! : -1)).filter((c) => c >= 0);
    const sendGaps = sentAt.slice(1).map((c, i) => c - sentAt[i]!);
    for (const g of sendGaps) expect(Math.abs(g - 1000 * MS)).toBeLessThanOrEqual(1 * MS);
  });

  it('report the input levels present at their tick, and no loss', () => {
    const records = decodeRun(run);
    const beats = heartbeatsOf(records);
    for (const b of beats) {
      const at = b.ticks + run.timer1StartCycle;
      let levels = 0;
      for (const a of run.applied) if (a.cycle <= at) levels = a.level ? levels | (1 << a.ch) : levels & ~(1 << a.ch);
      expect(b.levels, `levels at ${b.ticks}`).toBe(levels);
      expect(b.lost).toBe(0);
    }
    expect(new Set(beats.map((b) => b.levels)).size).toBeGreaterThan(1);
    expect(edgesOf(records)).toHaveLength(400);
  });
});

describeFirmware('commands', () => {
  let run: FirmwareRun;
  let sent: { t: number; text: string }[];
  beforeAll(async () => {
    sent = [
      { t: 1.0, text: '?\n' },
      { t: 1.1, text: 'P 500\n' },
      { t: 1.2, text: 'P 99\n' },
      { t: 1.3, text: 'P 60001\n' },
      { t: 1.4, text: 'P fast\n' },
      { t: 1.5, text: 'Q\n' },
      { t: 1.6, text: 'C 4\n' },
      { t: 1.7, text: `P ${'1'.repeat(20)}\n` },
      { t: 1.8, text: '\x02x\n' },
      { t: 1.9, text: '\r\n' },
      { t: 2.0, text: 'C 1\r\n' },
      { t: 3.5, text: 'C 3\n' },
      { t: 4.0, text: 'P 1000\n' },
    ];
    const edges = [
      { t_s: 2.5, ch: 0 as const, level: 1 as const },
      { t_s: 2.6, ch: 1 as const, level: 1 as const }, // ch1 is off (mask 1): not reported
      { t_s: 3.7, ch: 1 as const, level: 0 as const }, // back on: reported, ch0 stays high
    ];
    run = await runFirmware({ edges, durationS: 6.5, commands: sent.map((c) => ({ t_s: c.t, text: c.text })) });
  });

  it('answer ? with a hello carrying the same boot id, and every command with one reply in order', () => {
    const records = decodeRun(run);
    const hellos = records.filter((r): r is HelloRecord => r.kind === 'H');
    expect(hellos).toHaveLength(2);
    expect(hellos[0]!.seq).toBe(0);
    expect(hellos[1]!.boot).toBe(hellos[0]!.boot);
    expect(hellos[0]).toMatchObject({ proto: 1, fw: '0.1.0', mcu: 'm328p', hz: 16_000_000, ch: 2 });
    // simavr starts with MCUSR = PORF, as silicon does after power-on.
    expect(hellos[0]!.extra).toEqual({ rc: '1' });
    const replies = records.filter((r): r is ReplyRecord => r.kind === 'R');
    const summary = replies.map((r) => (r.ok ? `ok ${r.cmd} ${r.fields.join(' ')}` : `err ${r.cmd} ${r.reason}`));
    expect(summary).toEqual([
      'ok P ms=500',
      'err P range',
      'err P range',
      'err P syntax',
      'err Q unknown',
      'err C range',
      'err P too-long',
      'err - unknown',
      'ok C mask=1',
      'ok C mask=3',
      'ok P ms=1000',
    ]);
  });

  it('P changes the heartbeat period from the next beat on', () => {
    const records = decodeRun(run);
    const beats = heartbeatsOf(records);
    const sec = (t: number): number => t * EMULATOR_HZ - run.timer1StartCycle;
    const fast = beats.filter((b) => b.ticks > sec(1.2) && b.ticks < sec(4.0));
    expect(fast.length).toBeGreaterThanOrEqual(5);
    fast.slice(1).forEach((b, i) => expect(Math.abs(b.ticks - fast[i]!.ticks - 500 * MS)).toBeLessThanOrEqual(MS));
    const slow = beats.filter((b) => b.ticks > sec(4.0));
    expect(slow.length).toBeGreaterThanOrEqual(2);
    slow.slice(1).forEach((b, i) => expect(Math.abs(b.ticks - slow[i]!.ticks - 1000 * MS)).toBeLessThanOrEqual(MS));
  });

  it('C masks channels: edges of a disabled channel are not reported, levels still are', () => {
    const records = decodeRun(run);
    expect(edgesOf(records, 0).map((e) => e.edge)).toEqual(['r']);
    expect(edgesOf(records, 1).map((e) => e.edge)).toEqual(['f']);
    const beats = heartbeatsOf(records);
    const sec = (t: number): number => t * EMULATOR_HZ - run.timer1StartCycle;
    expect(beats.filter((b) => b.ticks > sec(2.7) && b.ticks < sec(3.6)).every((b) => b.levels === 3)).toBe(true);
    expect(beats.at(-1)!.levels).toBe(1);
  });
});

describeFirmware('watchdog', () => {
  it('resets the board when the main loop hangs: a new hello with rc=8 (WDRF), a new boot id, no reset loop', async () => {
    const run = await runFirmware({ edges: [], durationS: 5, stallAtS: 1.5 });
    // Hello, the room sensor's state (none fitted: absent), one heartbeat.
    const records = decodeRun({ ...run, lines: run.lines.slice(0, 3) });
    expect(records.map((r) => r.kind)).toEqual(['H', 'S', 'T']);
    const after = run.lines.slice(3).map((l) => decodeLine(l));
    const kinds = after.map((r) => (r.ok ? r.record.kind : 'rejected'));
    // 1 s watchdog: nothing between the hang and the reset, then a fresh boot that keeps running.
    expect(kinds.slice(0, 2)).toEqual(['H', 'S']);
    expect(kinds.slice(2).every((k) => k === 'T')).toBe(true);
    expect(kinds.length).toBeGreaterThanOrEqual(4);
    const hello = (after[0] as { ok: true; record: HelloRecord }).record;
    const first = records[0] as HelloRecord;
    expect(hello.seq).toBe(0);
    expect(hello.extra).toEqual({ rc: '8' });
    expect(hello.boot).not.toBe(first.boot);
    // The reset came between 1 s and 1.1 s after the hang (WDTO_1S; the 128 kHz oscillator, datasheet).
    const helloAt = run.lineCycles[3]! / run.hz;
    expect(helloAt - 1.5).toBeGreaterThan(1.0);
    expect(helloAt - 1.5).toBeLessThan(1.1);
  });
});

describeFirmware('configuration left by the firmware', () => {
  let run: FirmwareRun;
  beforeAll(async () => {
    run = await runFirmware({ edges: [], durationS: 0.3 });
  });

  it('programs the UART for DEFAULT_BAUD exactly: UBRR0 = 3, U2X0 = 0 (datasheet USART baud table: 250k, 0.0 %)', () => {
    expect([run.ubrr, run.u2x]).toEqual([3, 0]);
    expect(run.hz / (16 * (run.ubrr + 1))).toBe(DEFAULT_BAUD);
  });

  it('keeps the watchdog on in reset mode with a 1 s timeout (WDTCSR: WDE, WDP2:0 = 110)', () => {
    const w = run.registers.WDTCSR!;
    expect(w & 0x08).toBe(0x08); // WDE
    expect(w & 0x40).toBe(0); // WDIE off: a timeout resets
    expect(((w >> 2) & 0x08) | (w & 0x07)).toBe(0b0110); // WDP3..0 = 0110: 1.0 s at 128 kHz (datasheet)
  });

  it('leaves only the interrupt sources it needs enabled', () => {
    const r = run.registers;
    expect(r.EIMSK).toBe(0x01); // INT0
    expect(r.PCICR).toBe(0);
    expect(r.TIMSK0).toBe(0);
    expect(r.TIMSK2).toBe(0);
    expect(r.TIMSK1).toBe(0x23); // ICIE1 | OCIE1A | TOIE1
    expect(r.UCSR0B! & 0xe0).toBe(0x80); // RXCIE0 on, TXCIE0 off, UDRIE0 off when idle
    expect(r.ADCSRA! & 0x08).toBe(0); // ADIE
    expect(r.SPCR! & 0x80).toBe(0); // SPIE
    expect(r.TWCR! & 0x01).toBe(0); // TWIE
    expect(r.EECR! & 0x08).toBe(0); // EERIE
    expect(r.SPMCSR! & 0x80).toBe(0); // SPMIE
    expect(r.ACSR! & 0x88).toBe(0x80); // ACD on, ACIE off
    expect(r.PRR! & 0x65).toBe(0x65); // PRTIM2, PRTIM0, PRSPI, PRADC (the TWI is on for the room sensor)
    expect(r.TCCR1B! & 0x87).toBe(0x81); // ICNC1 on, prescaler 1
  });
});
