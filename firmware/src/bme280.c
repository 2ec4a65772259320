// The BME280 datasheet's integer compensation, as published (Bosch BST-BME280-DS001, sections 4.2.3 and
// 8.2): the same shifts in the same order, so results are bit-exact with any faithful copy. Pressure uses the
// 32-bit formula the datasheet gives for 8-bit controllers (typically 1 Pa, 1 sigma): the 64-bit one costs
// about 6 KB of flash in avr-gcc's 64-bit arithmetic, and 1 Pa is 1e-5 of the air density.
#include "bme280.h"

static uint16_t u16le(const uint8_t *b) { return (uint16_t)(b[0] | (uint16_t)b[1] << 8); }

void bme280_unpack_calib(bme280_calib_t *c, const uint8_t *tp, const uint8_t *h) {
  c->t1 = u16le(tp + 0);
  c->t2 = (int16_t)u16le(tp + 2);
  c->t3 = (int16_t)u16le(tp + 4);
  c->p1 = u16le(tp + 6);
  c->p2 = (int16_t)u16le(tp + 8);
  c->p3 = (int16_t)u16le(tp + 10);
  c->p4 = (int16_t)u16le(tp + 12);
  c->p5 = (int16_t)u16le(tp + 14);
  c->p6 = (int16_t)u16le(tp + 16);
  c->p7 = (int16_t)u16le(tp + 18);
  c->p8 = (int16_t)u16le(tp + 20);
  c->p9 = (int16_t)u16le(tp + 22);
  c->h1 = tp[25];
  c->h2 = (int16_t)u16le(h + 0);
  c->h3 = h[2];
  // H4 and H5 are 12-bit signed values sharing the nibbles of 0xE5.
  c->h4 = (int16_t)((int16_t)(int8_t)h[3] * 16 | (h[4] & 0x0f));
  c->h5 = (int16_t)((int16_t)(int8_t)h[5] * 16 | (h[4] >> 4));
  c->h6 = (int8_t)h[6];
}

uint8_t bme280_unpack_raw(bme280_raw_t *r, const uint8_t *d) {
  r->adc_p = (int32_t)((uint32_t)d[0] << 12 | (uint32_t)d[1] << 4 | d[2] >> 4);
  r->adc_t = (int32_t)((uint32_t)d[3] << 12 | (uint32_t)d[4] << 4 | d[5] >> 4);
  r->adc_h = (int32_t)((uint32_t)d[6] << 8 | d[7]);
  return r->adc_p != 0x80000 && r->adc_t != 0x80000 && r->adc_h != 0x8000;
}

int32_t bme280_temperature(const bme280_calib_t *c, int32_t adc_t, int32_t *t_fine) {
  int32_t var1 = ((((adc_t >> 3) - ((int32_t)c->t1 << 1))) * ((int32_t)c->t2)) >> 11;
  int32_t var2 = (((((adc_t >> 4) - ((int32_t)c->t1)) * ((adc_t >> 4) - ((int32_t)c->t1))) >> 12) * ((int32_t)c->t3)) >> 14;
  *t_fine = var1 + var2;
  return (*t_fine * 5 + 128) >> 8;
}

uint32_t bme280_pressure(const bme280_calib_t *c, int32_t adc_p, int32_t t_fine) {
  int32_t var1 = (((int32_t)t_fine) >> 1) - (int32_t)64000;
  int32_t var2 = (((var1 >> 2) * (var1 >> 2)) >> 11) * ((int32_t)c->p6);
  var2 = var2 + ((var1 * ((int32_t)c->p5)) << 1);
  var2 = (var2 >> 2) + (((int32_t)c->p4) << 16);
  var1 = (((c->p3 * (((var1 >> 2) * (var1 >> 2)) >> 13)) >> 3) + ((((int32_t)c->p2) * var1) >> 1)) >> 18;
  var1 = ((((32768 + var1)) * ((int32_t)c->p1)) >> 15);
  if (var1 == 0) return 0;  // the datasheet's guard against a division by zero
  uint32_t p = (((uint32_t)(((int32_t)1048576) - adc_p) - (var2 >> 12))) * 3125;
  if (p < 0x80000000)
    p = (p << 1) / ((uint32_t)var1);
  else
    p = (p / (uint32_t)var1) * 2;
  var1 = (((int32_t)c->p9) * ((int32_t)(((p >> 3) * (p >> 3)) >> 13))) >> 12;
  var2 = (((int32_t)(p >> 2)) * ((int32_t)c->p8)) >> 13;
  return (uint32_t)((int32_t)p + ((var1 + var2 + c->p7) >> 4));
}

uint32_t bme280_humidity(const bme280_calib_t *c, int32_t adc_h, int32_t t_fine) {
  int32_t v = (t_fine - ((int32_t)76800));
  v = (((((adc_h << 14) - (((int32_t)c->h4) << 20) - (((int32_t)c->h5) * v)) + ((int32_t)16384)) >> 15) *
       (((((((v * ((int32_t)c->h6)) >> 10) * (((v * ((int32_t)c->h3)) >> 11) + ((int32_t)32768))) >> 10) +
          ((int32_t)2097152)) * ((int32_t)c->h2) + 8192) >> 14));
  v = (v - (((((v >> 15) * (v >> 15)) >> 7) * ((int32_t)c->h1)) >> 4));
  v = (v < 0 ? 0 : v);
  v = (v > 419430400 ? 419430400 : v);
  uint32_t q10 = (uint32_t)v >> 12;  // %RH in Q22.10, at most 102400
  return (q10 * 1000 + 512) >> 10;   // thousandths of a percent, rounded half up
}
