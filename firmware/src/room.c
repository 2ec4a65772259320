// Room sensor state machine. Each call does one short step, so edges, heartbeats and commands are served
// between the steps; the 64-bit pressure formula runs on its own pass. Faults are reported once (by state
// change) and the sensor is probed again every ROOM_RETRY_S, from the start, so a replaced module works.
#include "room.h"

#include "board.h"
#include "bme280.h"
#include "twi.h"

#define TICKS_PER_S F_CPU
#define MEASURE_TICKS (BME280_MEASURE_MS * (F_CPU / 1000))

enum { ST_IDLE, ST_PROBE, ST_CALIB_TP, ST_CALIB_H, ST_CONFIG, ST_TRIGGER, ST_MEASURE, ST_READ, ST_TEMP, ST_PRESS, ST_HUM, ST_DONE };

static uint8_t step = ST_PROBE;
static uint8_t in_transfer;
static uint8_t addr = BME280_ADDR_PRIMARY;
static uint8_t calibrated;
static uint8_t state;
static uint8_t known;
static uint8_t dirty;
static uint16_t interval_s = ROOM_DEFAULT_S;
static uint64_t due;
static uint64_t taken;
static uint8_t wbuf[2];
static uint8_t rbuf[BME280_CALIB_TP_LEN];
static uint8_t calib_tp[BME280_CALIB_TP_LEN];
static bme280_calib_t cal;
static bme280_raw_t raw;
static int32_t t_fine;
static room_reading_t reading;
static uint8_t reading_ready;

static ticks48_t to_ticks48(uint64_t t) {
  ticks48_t r = {(uint32_t)(t >> 16), (uint16_t)t};
  return r;
}

static void set_state(uint8_t s) {
  if (!known || s != state) dirty = 1;
  state = s;
  known = 1;
}

static void fail(uint8_t why, uint64_t now) {
  calibrated = 0;
  in_transfer = 0;
  addr = BME280_ADDR_PRIMARY;
  set_state(why);
  due = now + (uint64_t)ROOM_RETRY_S * TICKS_PER_S;
  step = ST_IDLE;
}

// Starts a register write (n = 2: register, value) or a register read of rn bytes.
static void transfer(uint8_t reg, uint8_t value, uint8_t wn, uint8_t rn, uint64_t now) {
  wbuf[0] = reg;
  wbuf[1] = value;
  if (twi_begin(addr, wbuf, wn, rbuf, rn, now) == TWI_FAULT) return fail(ROOM_BUS, now);
  in_transfer = 1;
}

// Polls the transfer under way: 1 when it finished well; on failure the state machine has moved on.
static uint8_t transfer_done(uint64_t now) {
  twi_result_t r = twi_poll(now);
  if (r == TWI_BUSY) return 0;
  in_transfer = 0;
  if (r == TWI_DONE) return 1;
  if (r == TWI_NACK && step == ST_PROBE && addr == BME280_ADDR_PRIMARY) {
    addr = BME280_ADDR_SECONDARY;  // modules differ in how SDO is strapped: try the other address
    transfer(BME280_REG_CHIP_ID, 0, 1, 1, now);
    return 0;
  }
  fail(r == TWI_NACK ? ROOM_ABSENT : ROOM_BUS, now);
  return 0;
}

// The step after a finished transfer, and the transfer (if any) that it starts.
static void next_step(uint64_t now) {
  switch (step) {
    case ST_PROBE:
      if (rbuf[0] != BME280_CHIP_ID) return fail(ROOM_CHIP, now);
      step = ST_CALIB_TP;
      return transfer(BME280_REG_CALIB_TP, 0, 1, BME280_CALIB_TP_LEN, now);
    case ST_CALIB_TP:
      for (uint8_t i = 0; i < BME280_CALIB_TP_LEN; i++) calib_tp[i] = rbuf[i];
      step = ST_CALIB_H;
      return transfer(BME280_REG_CALIB_H, 0, 1, BME280_CALIB_H_LEN, now);
    case ST_CALIB_H:
      bme280_unpack_calib(&cal, calib_tp, rbuf);
      step = ST_CONFIG;
      // ctrl_hum takes effect at the next ctrl_meas write (datasheet), which every reading makes.
      return transfer(BME280_REG_CTRL_HUM, BME280_CTRL_HUM_X1, 2, 0, now);
    case ST_CONFIG:
      calibrated = 1;
      step = ST_IDLE;
      return;
    case ST_TRIGGER:
      taken = now;
      step = ST_MEASURE;
      return;
    case ST_READ:
      if (!bme280_unpack_raw(&raw, rbuf)) return fail(ROOM_CHIP, now);
      step = ST_TEMP;
      return;
  }
}

static void start_reading(uint64_t now) {
  if (!calibrated) {
    step = ST_PROBE;
    return transfer(BME280_REG_CHIP_ID, 0, 1, 1, now);
  }
  step = ST_TRIGGER;
  transfer(BME280_REG_CTRL_MEAS, BME280_CTRL_MEAS_FORCED_X1, 2, 0, now);
}

uint8_t room_service(uint64_t now) {
  if (in_transfer) {
    if (transfer_done(now)) next_step(now);
    return 1;
  }
  switch (step) {
    case ST_IDLE:
      if (!interval_s || reading_ready || now < due) return 0;
      start_reading(now);
      return 1;
    case ST_PROBE:  // at boot: the reading schedule starts here
      due = now;
      start_reading(now);
      return 1;
    case ST_MEASURE:
      if (now < taken + MEASURE_TICKS) return 0;
      step = ST_READ;
      transfer(BME280_REG_DATA, 0, 1, BME280_DATA_LEN, now);
      return 1;
    case ST_TEMP:
      reading.temp = bme280_temperature(&cal, raw.adc_t, &t_fine);
      step = ST_PRESS;
      return 1;
    case ST_PRESS:
      reading.press = bme280_pressure(&cal, raw.adc_p, t_fine);
      step = ST_HUM;
      return 1;
    case ST_HUM:
      reading.hum = bme280_humidity(&cal, raw.adc_h, t_fine);
      reading.at = to_ticks48(taken);
      reading_ready = 1;
      set_state(interval_s ? 0 : ROOM_OFF);
      // Each reading is due one interval after the previous one was due, not after its (slightly late) start,
      // so the schedule keeps the device's own cadence. Slots that already went by (a reading held up longer
      // than an interval) are skipped, as the device model skips them; A <s> restarts the schedule at once.
      if (interval_s) {
        uint64_t every = (uint64_t)interval_s * TICKS_PER_S;
        do due += every;
        while (due < now);
      }
      step = ST_IDLE;
      return 1;
  }
  return 0;
}

uint8_t room_wake_phase(uint32_t now_hi, uint16_t *lo) {
  ticks48_t at;
  if (in_transfer) return 0;
  if (step == ST_MEASURE)
    at = to_ticks48(taken + MEASURE_TICKS);
  else if (step == ST_IDLE && interval_s && !reading_ready)
    at = to_ticks48(due);
  else
    return 0;
  // Only in the overflow period before that time (or the one that holds it), so the match is that time itself
  // (or at worst one period early, once); a time further off costs no wake-up every period.
  if (at.hi - now_hi > 1) return 0;
  *lo = at.lo;
  return 1;
}

uint8_t room_busy(void) { return in_transfer || step == ST_PROBE || step == ST_TEMP || step == ST_PRESS || step == ST_HUM; }

void room_set_interval(uint16_t seconds, uint64_t now) {
  interval_s = seconds;
  if (!seconds) {
    set_state(ROOM_OFF);
    return;
  }
  due = now;  // the next reading's result, good or bad, replaces the off state
}

const room_reading_t *room_reading(void) { return reading_ready ? &reading : 0; }

void room_reading_sent(void) { reading_ready = 0; }

int16_t room_state_due(void) { return known && dirty ? state : -1; }

void room_state_sent(void) { dirty = 0; }

void room_announce(void) { dirty = 1; }
