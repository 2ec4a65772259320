// The room reading interval command `A <s>` (protocol/SPEC.md section 5): the real firmware in simavr with the
// emulated BME280, and the device model with a room, each switched off, set to 5 s and given bad arguments.
import { beforeAll, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { DEFAULT_TICK_HZ } from '../../protocol/link-defaults.ts';
import { SENSOR_FAULTS, type AirRecord, type DeviceRecord, type ReplyRecord } from '../../protocol/records.ts';
import { EMULATED_CALIBRATION, calibrationBytes, rawReading } from '../../sim/emulator/room-sensor.ts';
import { runFirmware, type FirmwareRun } from '../../sim/emulator/run-firmware.ts';
import { loadScenario, simulateDevice } from '../../sim/index.ts';
import type { RoomSetup } from '../../sim/room.ts';
import { decodeRun, heartbeatsOf, latencies } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

/** Nominal ticks per second: the interval is device time, checked against the hello's nominal rate. */
const HZ = DEFAULT_TICK_HZ;
const OFF_AT = 0.5;
const ON_AT = 31.5;
const DURATION_S = 47;
/** Off for three default intervals (10 s, SPEC section 5), then every 5 s, then two bad arguments. */
const COMMANDS = [
  { t_s: OFF_AT, text: 'A 0' },
  { t_s: ON_AT, text: 'A 5' },
  { t_s: 33.3, text: 'A x' },
  { t_s: 34.1, text: 'A 3601' },
];
const airOf = (rs: readonly DeviceRecord[]): AirRecord[] => rs.filter((r): r is AirRecord => r.kind === 'A');
const repliesOf = (rs: readonly DeviceRecord[]): ReplyRecord[] => rs.filter((r): r is ReplyRecord => r.kind === 'R');
const statesOf = (rs: readonly DeviceRecord[]): number[] => rs.flatMap((r) => (r.kind === 'S' ? [r.state] : []));

/** What both devices must show, the time of the command A 5's LF given in ticks; returns each reading's lateness. */
function expectInterval(records: readonly DeviceRecord[], onTicks: number): number[] {
  expect(repliesOf(records).map((r) => (r.ok ? `ok ${r.cmd} ${r.fields.join(' ')}` : `err ${r.cmd} ${r.reason}`))).toEqual([
    'ok A s=0',
    'ok A s=5',
    'err A syntax',
    'err A range',
  ]);
  // Readings on at boot (S 0 with the first), off (S 8), on again (S 0 with the first after A 5).
  expect(statesOf(records)).toEqual([0, SENSOR_FAULTS.off, 0]);
  const air = airOf(records);
  // Off: no reading between the command and A 5, over three default intervals.
  const offTicks = air.filter((a) => a.ticks > OFF_AT * HZ && a.ticks < onTicks);
  expect(offTicks).toEqual([]);
  // On: the first reading at once, then one every 5 s of device time on a grid laid from the command: each is due
  // 5 s after the previous one was due, not after its start (firmware/src/room.c), and a Timer1 compare-B wake-up
  // starts it at that time (firmware/src/main.c), not at the next overflow (up to 65536 ticks later). The ticks
  // are when the sensor was told to measure: after the trigger's bus write (about 29 bit times at 100 kHz,
  // 0.29 ms) and, for the first, after the reply to A 5 was formatted; the model reports the due time itself.
  const on = air.filter((a) => a.ticks >= onTicks);
  expect(on.length).toBe(4); // at 0, 5, 10 and 15 s after the command (the run ends 15.5 s after it)
  const late = on.map((a, k) => a.ticks - onTicks - k * 5 * HZ);
  late.forEach((l, k) => {
    expect(l, `reading ${k} after A 5`).toBeGreaterThanOrEqual(0);
    expect(l, `reading ${k} after A 5`).toBeLessThanOrEqual((k === 0 ? 1e-3 : 0.5e-3) * HZ);
  });
  // No drift: the readings after the first are 5 s apart to 0.1 ms. Scheduled from each start instead, every
  // spacing would be at least the bus write (4640 ticks) long, and up to an overflow more.
  on.slice(2).forEach((a, i) => expect(Math.abs(a.ticks - on[i + 1]!.ticks - 5 * HZ), `spacing ${i + 2}`).toBeLessThanOrEqual(1e-4 * HZ));
  return late;
}

describeFirmware('A <s> on the firmware with the emulated BME280', () => {
  let run: FirmwareRun;
  let records: DeviceRecord[];
  beforeAll(async () => {
    const samples = Array.from({ length: DURATION_S + 1 }, (_, k) => rawReading(EMULATED_CALIBRATION, k, 21 + 0.01 * k, 101325, 45));
    // Pulses on both channels throughout, so timing is checked while the commands and readings come and go.
    const edges = Array.from({ length: Math.floor((DURATION_S - 1) / 0.25) }, (_, k) => k).flatMap((k) => {
      const t = 0.6 + k * 0.25;
      const ch = (k % 2) as 0 | 1;
      return [{ t_s: t, ch, level: 1 as const }, { t_s: t + 0.02, ch, level: 0 as const }];
    });
    run = await runFirmware({ edges, durationS: DURATION_S, room: { addr: 0x76, calib: calibrationBytes(EMULATED_CALIBRATION), samples }, commands: COMMANDS.map((c) => ({ ...c, text: `${c.text}\n` })) });
    records = decodeRun(run);
  }, 120_000);

  it('A 0 stops the readings, A 5 gives one every 5 s of device time, bad arguments get syntax and range', () => {
    // The command's bytes start at ON_AT (run-firmware.ts); its LF has arrived four byte times (10 bits each) later.
    const onTicks = ON_AT * run.hz - run.timer1StartCycle + (4 * 10 * run.hz) / 250_000;
    // Each A record's ticks are when the emulated sensor was told to measure (within the bus write's time).
    airOf(records).forEach((a, i) => expect(a.ticks - (run.roomServed[i]!.cycle - run.timer1StartCycle)).toBeLessThan(0.5 * HZ / 1000));
    const late = expectInterval(records, onTicks);
    const air = airOf(records).filter((a) => a.ticks >= onTicks);
    console.log(`firmware: readings after A 5 taken ${late.map((l) => (l / HZ * 1e3).toFixed(3)).join(', ')} ms after the command + k·5 s; spacings ${air.slice(1).map((a, i) => a.ticks - air[i]!.ticks - 5 * HZ).join(', ')} ticks off 5 s`);
  });

  it('timing stays intact throughout: heartbeats every 1000 ms ± 1 ms, nothing lost, every edge at its cycle', () => {
    const hb = heartbeatsOf(records);
    expect(hb.length).toBe(DURATION_S - 1);
    hb.slice(1).forEach((b, i) => expect(Math.abs(b.ticks - hb[i]!.ticks - HZ)).toBeLessThanOrEqual(HZ / 1000));
    expect(hb.at(-1)!.lost).toBe(0);
    for (const ch of [0, 1] as const) for (const l of latencies(run, records, ch)) expect(l).toBeLessThanOrEqual(ch ? 260 : 0);
  });
});

it('A <s> on the device model with a room: the same replies, states and intervals as the firmware', () => {
  const room: RoomSetup = {
    temp_mean_C: 21, temp_amp_K: 2, temp_period_h: 24, press_Pa: 101325, front_Pa: 0, front_at_h: 1, front_width_h: 1,
    rh_mean_pct: 45, rh_amp_pct: 5, expansion_per_K: 18e-6, length_temp_C: 21, interval_s: 10, clock_tempco_ppm_per_K: 0,
  };
  const sc = loadScenario('ideal-60deg');
  const { device } = simulateDevice({ ...sc, room }, { seed: 5, durationS: DURATION_S, no_faults: true });
  const boot = sc.device.first_boot_s;
  const recs: DeviceRecord[] = [];
  const take = (upTo: number) => {
    while (device.peekTime() <= upTo) recs.push((decodeLine(device.pop()!.line) as { record: DeviceRecord }).record);
  };
  for (const c of COMMANDS) {
    take(boot + c.t_s);
    device.command(boot + c.t_s, c.text);
  }
  take(boot + DURATION_S);
  // The model's counter starts at its boot (a phase below one tick), so the command's tick is its time since boot.
  expectInterval(recs, ON_AT * HZ);
});
