// The room sensor end to end: the real firmware reads an emulated BME280 on simavr's TWI, compensates with
// the datasheet's integer formulas, and keeps timing exact through sensor reads, a missing sensor, a
// sensor that stops answering and a bus held low.
import { execFileSync } from 'node:child_process';
import fc from 'fast-check';
import { beforeAll, expect, it } from 'vitest';
import type { AirRecord, DeviceRecord, ReplyRecord, SensorRecord } from '../../protocol/records.ts';
import { SENSOR_FAULTS } from '../../protocol/records.ts';
import { DEFAULT_TICK_HZ } from '../../protocol/link-defaults.ts';
import { EMULATED_CALIBRATION, calibrationBytes, rawReading } from '../../sim/emulator/room-sensor.ts';
import { runFirmware, type FirmwareEdge, type FirmwareRun, type RawRoomSample } from '../../sim/emulator/run-firmware.ts';
import { REPO_ROOT } from '../../sim/emulator/toolchain.ts';
import { compensateAll, compensateT, compensateP32, unpackCalib } from '../reference/bme280.ts';
import { decodeRun, heartbeatsOf, latencies } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const MS = DEFAULT_TICK_HZ / 1000;
const CALIB = calibrationBytes(EMULATED_CALIBRATION);
const airOf = (rs: readonly DeviceRecord[]): AirRecord[] => rs.filter((r): r is AirRecord => r.kind === 'A');
const statesOf = (rs: readonly DeviceRecord[]): number[] => rs.filter((r): r is SensorRecord => r.kind === 'S').map((r) => r.state);

/** A compressed day: temperature ±2 K, a pressure front, humidity following, a new value every 0.5 s. */
function environment(durationS: number): RawRoomSample[] {
  return Array.from({ length: Math.ceil(durationS / 0.5) + 1 }, (_, k) => {
    const t = k * 0.5;
    const w = (2 * Math.PI * t) / durationS;
    return rawReading(EMULATED_CALIBRATION, t, 21 + 2 * Math.sin(w), 101325 - 900 * Math.tanh((t - durationS / 2) / 3), 45 + 10 * Math.cos(w));
  });
}

/** Heartbeats keep 1000 ms ± 1 ms of device time and nothing is lost: the timing the sensor must not disturb. */
function expectTimingIntact(run: FirmwareRun, records: readonly DeviceRecord[], beats: number): void {
  const hb = heartbeatsOf(records);
  expect(hb.length).toBe(beats);
  hb.slice(1).forEach((b, i) => expect(Math.abs(b.ticks - hb[i]!.ticks - 1000 * MS)).toBeLessThanOrEqual(MS));
  expect(hb.at(-1)!.lost).toBe(0);
  for (const ch of [0, 1] as const) for (const l of latencies(run, records, ch)) expect(l).toBeLessThanOrEqual(ch ? 260 : 0);
}

/** Pulses of 20 µs every 2.5 ms on ch0 and, offset, on ch1: edges in every phase of every sensor read. */
function pulseTrain(fromS: number, toS: number): FirmwareEdge[] {
  const out: FirmwareEdge[] = [];
  for (let t = fromS, k = 0; t < toS; t += 0.0025, k++) {
    const ch = (k % 2) as 0 | 1;
    const at = t + k * 1.3e-6; // walk the phase against the firmware's steps
    out.push({ t_s: at, ch, level: 1 }, { t_s: at + 20e-6, ch, level: 0 });
  }
  return out;
}

describeFirmware('BME280 compensation in the firmware (host build of firmware/src/bme280.c)', () => {
  const checker = `${REPO_ROOT}firmware/build/host/format-check`;
  beforeAll(() => {
    execFileSync('make', ['-s', '-C', `${REPO_ROOT}firmware`, 'host-check']);
  });
  const ask = (reqs: string[]): string[] => execFileSync(checker, { input: reqs.map((r) => `${r}\n`).join('') }).toString().trim().split('\n');
  const data = (t: number, p: number, h: number): string =>
    Buffer.from([p >> 12, (p >> 4) & 0xff, (p & 0xf) << 4, t >> 12, (t >> 4) & 0xff, (t & 0xf) << 4, h >> 8, h & 0xff]).toString('hex');

  it("gives the BMP280 datasheet's worked example (same T/P formulas): 25.08 °C exactly, and 100653.27 Pa within the 32-bit formula's few pascals", () => {
    // BMP280 datasheet BST-BMP280-DS001 section 3.12 (docs/references.md#ref-bme280): adc_T 519888, adc_P 415148.
    const [ok, t, p] = ask([`bme ${Buffer.from(CALIB).toString('hex')} ${data(519888, 415148, 0x6000)}`])[0]!.split(' ').map(Number);
    expect(ok).toBe(1);
    expect(t).toBe(2508);
    expect(compensateT(unpackCalib(CALIB), 519888).tFine).toBe(128422n);
    expect(Math.abs(p! - 100653.27)).toBeLessThanOrEqual(3);
    expect(p).toBe(compensateP32(unpackCalib(CALIB), 415148, 128422n));
  });

  it('equals an independent TypeScript copy of the datasheet formulas bit for bit, over random calibrations and readings (property)', () => {
    const cal = fc.record({
      T1: fc.integer({ min: 26000, max: 29000 }), T2: fc.integer({ min: 25000, max: 28000 }), T3: fc.integer({ min: -1000, max: 500 }),
      P1: fc.integer({ min: 35000, max: 39000 }), P2: fc.integer({ min: -11000, max: -10000 }), P3: fc.integer({ min: 2500, max: 3500 }),
      P4: fc.integer({ min: 2000, max: 9000 }), P5: fc.integer({ min: -200, max: 200 }), P6: fc.integer({ min: -10, max: 0 }),
      P7: fc.integer({ min: 9000, max: 16000 }), P8: fc.integer({ min: -15000, max: -9000 }), P9: fc.integer({ min: 4000, max: 6000 }),
      H1: fc.integer({ min: 0, max: 100 }), H2: fc.integer({ min: 300, max: 400 }), H3: fc.integer({ min: 0, max: 10 }),
      H4: fc.integer({ min: 250, max: 400 }), H5: fc.integer({ min: 0, max: 100 }), H6: fc.integer({ min: 0, max: 40 }),
    });
    const cases = fc.sample(fc.tuple(cal, fc.integer({ min: 400000, max: 600000 }), fc.integer({ min: 250000, max: 500000 }), fc.integer({ min: 0, max: 0xffff })), { numRuns: 2000, seed: 18 });
    const got = ask(cases.map(([c, t, p, h]) => `bme ${Buffer.from(calibrationBytes(c)).toString('hex')} ${data(t, p, h)}`));
    cases.forEach(([c, t, p, h], i) => {
      const want = compensateAll(unpackCalib(calibrationBytes(c)), t, p, h);
      expect(got[i], JSON.stringify([c, t, p, h])).toBe(`1 ${want.temp} ${want.press} ${want.hum}`);
    });
  });

  it("reports a skipped quantity (the chip's 0x80000 / 0x8000) instead of a number", () => {
    const [line] = ask([`bme ${Buffer.from(CALIB).toString('hex')} ${data(519888, 0x80000, 0x6000)}`]);
    expect(line!.split(' ')[0]).toBe('0');
  });
});

describeFirmware('room readings from the emulated sensor', () => {
  const durationS = 12.2;
  const samples = environment(durationS);
  let run: FirmwareRun;
  let records: DeviceRecord[];
  beforeAll(async () => {
    run = await runFirmware({
      edges: pulseTrain(0.3, 11.8),
      durationS,
      room: { addr: 0x77, calib: CALIB, samples },
      commands: [{ t_s: 0.2, text: 'A 1\n' }],
    });
    records = decodeRun(run);
  });

  it('says the sensor reads normally (S 0) once, and replies to A with the new interval', () => {
    expect(statesOf(records)).toEqual([0]);
    const reply = records.find((r): r is ReplyRecord => r.kind === 'R');
    expect(reply).toMatchObject({ ok: true, cmd: 'A', fields: ['s=1'] });
  });

  it('sends every reading exactly as the datasheet integer formulas give it from the raw values served', () => {
    const air = airOf(records);
    expect(air.length).toBe(run.roomServed.length);
    expect(air.length).toBeGreaterThanOrEqual(12);
    const cal = unpackCalib(CALIB);
    air.forEach((a, i) => {
      const s = run.roomServed[i]!;
      expect({ temp: a.temp, press: a.press, hum: a.hum }).toEqual(compensateAll(cal, s.adcT, s.adcP, s.adcH));
      // The A record's ticks are when the measurement was started (the ctrl_meas write), within the write's bus time.
      const startTicks = s.cycle - run.timer1StartCycle;
      expect(a.ticks - startTicks).toBeGreaterThanOrEqual(0);
      expect(a.ticks - startTicks).toBeLessThan(0.5 * MS);
    });
  });

  it('matches the scripted environment within the resolution (0.01 K, a few Pa, 0.02 %RH)', () => {
    for (const a of airOf(records)) {
      const t_s = (a.ticks + run.timer1StartCycle) / run.hz;
      const env = samples.filter((s) => s.t_s <= t_s).at(-1)!;
      const want = compensateAll(unpackCalib(CALIB), env.adcT, env.adcP, env.adcH);
      expect(a).toMatchObject(want);
    }
    const temps = airOf(records).map((a) => a.temp / 100);
    expect(Math.max(...temps) - Math.min(...temps)).toBeGreaterThan(3); // the ±2 K cycle came through
  });

  it('keeps the interval (1 s of device time after the command) and sleeps the TWI steps between edges', () => {
    const air = airOf(records).slice(1);
    air.slice(1).forEach((a, i) => expect(Math.abs(a.ticks - air[i]!.ticks - 1000 * MS)).toBeLessThanOrEqual(MS));
  });

  it('loses no edge and shifts none while the sensor is read: 2 × 4600 edges in every phase of every read', () => {
    expectTimingIntact(run, records, 12);
  });
});

describeFirmware('room sensor faults leave timing intact', () => {
  const durationS = 25.5;
  const edges = pulseTrain(0.3, 25).filter((_, i) => i % 8 < 2);
  let absent: { run: FirmwareRun; records: DeviceRecord[] };
  let lost: { run: FirmwareRun; records: DeviceRecord[] };
  let stuck: { run: FirmwareRun; records: DeviceRecord[] };
  let hung: { run: FirmwareRun; records: DeviceRecord[] };
  beforeAll(async () => {
    const samples = environment(durationS);
    const go = async (extra: Partial<Parameters<typeof runFirmware>[0]>) => {
      const run = await runFirmware({ edges, durationS, ...extra });
      return { run, records: decodeRun(run) };
    };
    [absent, lost, stuck, hung] = await Promise.all([
      go({}),
      go({ room: { addr: 0x76, calib: CALIB, samples, absentAtS: 4.5, returnAtS: 12 } }),
      go({ room: { addr: 0x76, calib: CALIB, samples }, sdaLowAtS: 4.5 }),
      go({ room: { addr: 0x76, calib: CALIB, samples }, twiHangAtS: 4.5 }),
    ]);
  });

  it('no sensor: says absent once (not at every slow retry), sends no reading', () => {
    expect(statesOf(absent.records)).toEqual([SENSOR_FAULTS.absent]);
    expect(airOf(absent.records)).toEqual([]);
    expectTimingIntact(absent.run, absent.records, 25);
  });

  it('a sensor that stops answering: absent once, then back (S 0) and readings again after a slow retry', () => {
    expect(statesOf(lost.records)).toEqual([0, SENSOR_FAULTS.absent, 0]);
    const times = airOf(lost.records).map((a) => a.ticks / DEFAULT_TICK_HZ);
    expect(times.filter((t) => t > 4.5 && t < 12)).toEqual([]);
    expect(times.filter((t) => t >= 12).length).toBeGreaterThanOrEqual(1);
    expectTimingIntact(lost.run, lost.records, 25);
  });

  it('a bus held low, and a bus that stops mid-transfer (seen only by the step timeout): bus fault once, no hang', () => {
    for (const { run, records } of [stuck, hung]) {
      expect(statesOf(records)).toEqual([0, SENSOR_FAULTS.bus]);
      expect(airOf(records).every((a) => a.ticks / DEFAULT_TICK_HZ < 4.5)).toBe(true);
      expectTimingIntact(run, records, 25);
    }
  });
});
