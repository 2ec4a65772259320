// An independent TypeScript copy of the BME280 datasheet's integer compensation (Bosch BST-BME280-DS001,
// section 4.2.3 for temperature and humidity, section 8.2 for the 32-bit pressure formula), in BigInt with
// C's 32-bit wrap made explicit, for checking the firmware's C bit for bit. Calibration layout: Table 16.
const i32 = (v: bigint): bigint => BigInt.asIntN(32, v);
const u32 = (v: bigint): bigint => BigInt.asUintN(32, v);

export interface Bme280Calib {
  T1: number; T2: number; T3: number;
  P1: number; P2: number; P3: number; P4: number; P5: number; P6: number; P7: number; P8: number; P9: number;
  H1: number; H2: number; H3: number; H4: number; H5: number; H6: number;
}

/** Calibration words from the 33 bytes of 0x88..0xA1 and 0xE1..0xE7 (datasheet Table 16). */
export function unpackCalib(b: Uint8Array): Bme280Calib {
  const u16 = (i: number): number => b[i]! | (b[i + 1]! << 8);
  const s16 = (i: number): number => (u16(i) << 16) >> 16;
  const s8 = (v: number): number => (v << 24) >> 24;
  return {
    T1: u16(0), T2: s16(2), T3: s16(4),
    P1: u16(6), P2: s16(8), P3: s16(10), P4: s16(12), P5: s16(14), P6: s16(16), P7: s16(18), P8: s16(20), P9: s16(22),
    H1: b[25]!, H2: s16(26), H3: b[28]!,
    H4: s8(b[29]!) * 16 + (b[30]! & 0x0f),
    H5: s8(b[31]!) * 16 + (b[30]! >> 4),
    H6: s8(b[32]!),
  };
}

/** Temperature (hundredths of °C) and t_fine. */
export function compensateT(c: Bme280Calib, adcT: number): { temp: number; tFine: bigint } {
  const a = BigInt(adcT);
  const var1 = i32((((a >> 3n) - (BigInt(c.T1) << 1n)) * BigInt(c.T2)) >> 11n);
  const d = (a >> 4n) - BigInt(c.T1);
  const var2 = i32((((d * d) >> 12n) * BigInt(c.T3)) >> 14n);
  const tFine = i32(var1 + var2);
  return { temp: Number(i32(tFine * 5n + 128n) >> 8n), tFine };
}

/** Pressure in Pa by the datasheet's 32-bit formula (section 8.2). */
export function compensateP32(c: Bme280Calib, adcP: number, tFine: bigint): number {
  let var1 = i32((tFine >> 1n) - 64000n);
  const sq = (v: bigint): bigint => i32((v >> 2n) * (v >> 2n));
  let var2 = i32((sq(var1) >> 11n) * BigInt(c.P6));
  var2 = i32(var2 + i32(i32(var1 * BigInt(c.P5)) << 1n));
  var2 = i32((var2 >> 2n) + (BigInt(c.P4) << 16n));
  var1 = i32((i32(i32(BigInt(c.P3) * (sq(var1) >> 13n)) >> 3n) + (i32(BigInt(c.P2) * var1) >> 1n)) >> 18n);
  var1 = i32(i32((32768n + var1) * BigInt(c.P1)) >> 15n);
  if (var1 === 0n) return 0;
  let p = u32(u32(u32(1048576n - BigInt(adcP)) - u32(var2 >> 12n)) * 3125n);
  p = p < 0x80000000n ? u32(p << 1n) / u32(var1) : u32((p / u32(var1)) * 2n);
  const q = u32(p >> 3n);
  var1 = i32(i32(BigInt(c.P9) * i32(u32(q * q) >> 13n)) >> 12n);
  var2 = i32(i32(i32(p >> 2n) * BigInt(c.P8)) >> 13n);
  return Number(u32(i32(p) + ((var1 + var2 + BigInt(c.P7)) >> 4n)));
}

/** Humidity as the datasheet's Q22.10 %RH (section 4.2.3). */
export function compensateHQ10(c: Bme280Calib, adcH: number, tFine: bigint): number {
  let v = i32(tFine - 76800n);
  const a = i32(i32(i32(BigInt(adcH) << 14n) - i32(BigInt(c.H4) << 20n) - i32(BigInt(c.H5) * v)) + 16384n) >> 15n;
  const b = i32(i32(v * BigInt(c.H6)) >> 10n);
  const e = i32(i32(v * BigInt(c.H3)) >> 11n) + 32768n;
  const f = i32(i32(i32(b * e) >> 10n) + 2097152n);
  v = i32(a * (i32(f * BigInt(c.H2) + 8192n) >> 14n));
  v = i32(v - (i32(i32(i32((v >> 15n) * (v >> 15n)) >> 7n) * BigInt(c.H1)) >> 4n));
  if (v < 0n) v = 0n;
  if (v > 419430400n) v = 419430400n;
  return Number(v >> 12n);
}

/** What the A record carries: hundredths of °C, Pa, thousandths of %RH (Q22.10 rounded half up). */
export function compensateAll(c: Bme280Calib, adcT: number, adcP: number, adcH: number): { temp: number; press: number; hum: number } {
  const { temp, tFine } = compensateT(c, adcT);
  return { temp, press: compensateP32(c, adcP, tFine), hum: Math.floor((compensateHQ10(c, adcH, tFine) * 1000 + 512) / 1024) };
}
