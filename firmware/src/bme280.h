// BME280 register map, calibration and the datasheet's integer compensation (pure; also built for the host tests).
#ifndef BME280_H
#define BME280_H

#include <stdint.h>

// Register map (Bosch BME280 datasheet, memory map).
#define BME280_ADDR_PRIMARY 0x76  // SDO to GND
#define BME280_ADDR_SECONDARY 0x77  // SDO to VDDIO (most breakout modules)
#define BME280_REG_CALIB_TP 0x88  // 0x88..0xA1: T1..T3, P1..P9, (0xA0 unused), H1
#define BME280_CALIB_TP_LEN 26
#define BME280_REG_CHIP_ID 0xD0
#define BME280_CHIP_ID 0x60
#define BME280_REG_CALIB_H 0xE1  // 0xE1..0xE7: H2..H6
#define BME280_CALIB_H_LEN 7
#define BME280_REG_CTRL_HUM 0xF2
#define BME280_REG_CTRL_MEAS 0xF4
#define BME280_REG_DATA 0xF7  // 0xF7..0xFE: press, temp (20 bits each), hum (16 bits)
#define BME280_DATA_LEN 8
// Oversampling x1 for humidity; x1 temperature, x1 pressure, forced mode (one measurement, then sleep).
#define BME280_CTRL_HUM_X1 0x01
#define BME280_CTRL_MEAS_FORCED_X1 0x25
// Longest x1/x1/x1 measurement: 1.25 + 2.3 + (2.3 + 0.575) + (2.3 + 0.575) ms = 9.3 ms (datasheet,
// measurement time, maximum); the firmware waits 10 ms.
#define BME280_MEASURE_MS 10

typedef struct {
  uint16_t t1;
  int16_t t2, t3;
  uint16_t p1;
  int16_t p2, p3, p4, p5, p6, p7, p8, p9;
  uint8_t h1, h3;
  int16_t h2, h4, h5;
  int8_t h6;
} bme280_calib_t;

typedef struct {
  int32_t adc_t, adc_p, adc_h;
} bme280_raw_t;

// Unpacks the two calibration blocks as read from 0x88 (26 bytes) and 0xE1 (7 bytes).
void bme280_unpack_calib(bme280_calib_t *c, const uint8_t *tp, const uint8_t *h);
// Unpacks the 8 data bytes read from 0xF7. Returns 0 when a quantity was skipped (the chip's 0x80000/0x8000).
uint8_t bme280_unpack_raw(bme280_raw_t *r, const uint8_t *d);
// The datasheet's compensation, split so that the main loop can do one per pass. t_fine comes from the first.
// Temperature in hundredths of a degree Celsius.
int32_t bme280_temperature(const bme280_calib_t *c, int32_t adc_t, int32_t *t_fine);
// Pressure in pascals, the datasheet's 32-bit formula (0 if the calibration is unusable).
uint32_t bme280_pressure(const bme280_calib_t *c, int32_t adc_p, int32_t t_fine);
// Relative humidity in thousandths of a percent, rounded from the 32-bit formula's Q22.10 result.
uint32_t bme280_humidity(const bme280_calib_t *c, int32_t adc_h, int32_t t_fine);

#endif
