// The emulated BME280's side of a scripted environment: raw ADC readings that give a wanted temperature,
// pressure and humidity, found by bisection through the datasheet's double-precision compensation
// (Bosch BST-BME280-DS001, appendix 8.1; the firmware uses the integer formulas, so tests compare two forms).
import type { RawRoomSample } from './run-firmware.ts';

/** Calibration words of a BME280 (datasheet Table 16). */
export interface RoomCalibration {
  readonly T1: number; readonly T2: number; readonly T3: number;
  readonly P1: number; readonly P2: number; readonly P3: number; readonly P4: number; readonly P5: number;
  readonly P6: number; readonly P7: number; readonly P8: number; readonly P9: number;
  readonly H1: number; readonly H2: number; readonly H3: number; readonly H4: number; readonly H5: number; readonly H6: number;
}

/**
 * The emulated part's calibration. T and P: the worked example of the BMP280 datasheet (same formulas);
 * H: values of the size real parts carry (invented; any plausible set works).
 */
export const EMULATED_CALIBRATION: RoomCalibration = {
  T1: 27504, T2: 26435, T3: -1000,
  P1: 36477, P2: -10685, P3: 3024, P4: 2855, P5: 140, P6: -7, P7: 15500, P8: -14600, P9: 6000,
  H1: 75, H2: 362, H3: 0, H4: 313, H5: 50, H6: 30,
};

/** The 33 register bytes (0x88..0xA1, 0xE1..0xE7) that hold a calibration. */
export function calibrationBytes(c: RoomCalibration): Uint8Array {
  const b = new Uint8Array(33);
  const w16 = (i: number, v: number): void => {
    b[i] = v & 0xff;
    b[i + 1] = (v >> 8) & 0xff;
  };
  [c.T1, c.T2, c.T3, c.P1, c.P2, c.P3, c.P4, c.P5, c.P6, c.P7, c.P8, c.P9].forEach((v, k) => w16(2 * k, v));
  b[25] = c.H1;
  w16(26, c.H2);
  b[28] = c.H3;
  b[29] = (c.H4 >> 4) & 0xff;
  b[30] = (c.H4 & 0x0f) | ((c.H5 & 0x0f) << 4);
  b[31] = (c.H5 >> 4) & 0xff;
  b[32] = c.H6 & 0xff;
  return b;
}

function tFineOf(c: RoomCalibration, adcT: number): number {
  const v1 = (adcT / 16384 - c.T1 / 1024) * c.T2;
  const d = adcT / 131072 - c.T1 / 8192;
  return v1 + d * d * c.T3;
}

function pressureOf(c: RoomCalibration, adcP: number, tFine: number): number {
  let v1 = tFine / 2 - 64000;
  let v2 = (v1 * v1 * c.P6) / 32768;
  v2 = v2 + v1 * c.P5 * 2;
  v2 = v2 / 4 + c.P4 * 65536;
  v1 = ((c.P3 * v1 * v1) / 524288 + c.P2 * v1) / 524288;
  v1 = (1 + v1 / 32768) * c.P1;
  let p = 1048576 - adcP;
  p = ((p - v2 / 4096) * 6250) / v1;
  return p + ((c.P9 * p * p) / 2147483648 + (p * c.P8) / 32768 + c.P7) / 16;
}

function humidityOf(c: RoomCalibration, adcH: number, tFine: number): number {
  let h = tFine - 76800;
  h = (adcH - (c.H4 * 64 + (c.H5 / 16384) * h)) * ((c.H2 / 65536) * (1 + (c.H6 / 67108864) * h * (1 + (c.H3 / 67108864) * h)));
  return h * (1 - (c.H1 * h) / 524288);
}

/** The integer in [lo, hi] where f (monotonic) comes closest to want. */
function bisect(f: (x: number) => number, want: number, lo: number, hi: number): number {
  const up = f(hi) > f(lo);
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (f(mid) < want === up) lo = mid;
    else hi = mid;
  }
  return Math.abs(f(lo) - want) <= Math.abs(f(hi) - want) ? lo : hi;
}

/** Raw readings for temperature (°C), pressure (Pa) and relative humidity (%) at time t_s. */
export function rawReading(c: RoomCalibration, t_s: number, tempC: number, pressPa: number, rhPct: number): RawRoomSample {
  const adcT = bisect((x) => tFineOf(c, x) / 5120, tempC, 0, 0xfffff);
  const tFine = Math.trunc(tFineOf(c, adcT));
  const adcP = bisect((x) => pressureOf(c, x, tFine), pressPa, 0, 0xfffff);
  const adcH = bisect((x) => humidityOf(c, x, tFine), rhPct, 0, 0xffff);
  return { t_s, adcT, adcP, adcH };
}
