// Polled TWI master: one bus step per call, each bounded by a deadline, so a missing or stuck device can
// only cost a failed transfer, never a hang. Status codes: ATmega328P datasheet, TWI status tables.
#include "twi.h"

#include <avr/io.h>
#include <avr/power.h>

#include "board.h"

#define TWI_HZ 100000UL
// One step (a start, an address or one byte: about 0.1 ms at 100 kHz) may take at most this long.
#define TWI_STEP_TICKS (F_CPU / 500)  // 2 ms

enum { PH_START, PH_ADDR_W, PH_WRITE, PH_RESTART, PH_ADDR_R, PH_READ };

static const uint8_t *wbuf;
static uint8_t *rbuf;
static uint8_t wlen, rlen, idx, sla, phase;
static uint64_t deadline;

static void go(uint8_t extra, uint64_t now) {
  TWCR = _BV(TWINT) | _BV(TWEN) | extra;
  deadline = now + TWI_STEP_TICKS;
}

static void off(void) { TWCR = 0; }

static twi_result_t finish(twi_result_t r) {
  TWCR = _BV(TWINT) | _BV(TWEN) | _BV(TWSTO);
  return r;
}

twi_result_t twi_begin(uint8_t addr, const uint8_t *w, uint8_t wn, uint8_t *r, uint8_t rn, uint64_t now) {
  // With the pull-ups on, a line that reads low before a start is held by something on the bus.
  if ((PINC & (_BV(PC4) | _BV(PC5))) != (_BV(PC4) | _BV(PC5))) {
    off();
    return TWI_FAULT;
  }
  power_twi_enable();
  TWSR = 0;
  TWBR = (uint8_t)((F_CPU / TWI_HZ - 16) / 2);
  wbuf = w;
  rbuf = r;
  wlen = wn;
  rlen = rn;
  sla = (uint8_t)(addr << 1);
  phase = PH_START;
  go(_BV(TWSTA), now);
  return TWI_BUSY;
}

static void read_next(uint64_t now) { go(idx + 1 < rlen ? _BV(TWEA) : 0, now); }

twi_result_t twi_poll(uint64_t now) {
  if (!(TWCR & _BV(TWINT))) {
    if (now < deadline) return TWI_BUSY;
    off();
    return TWI_FAULT;
  }
  uint8_t st = TWSR & 0xf8;
  switch (phase) {
    case PH_START:
    case PH_RESTART:
      if (st != 0x08 && st != 0x10) break;
      TWDR = phase == PH_START && wlen ? sla : (uint8_t)(sla | 1);
      phase = phase == PH_START && wlen ? PH_ADDR_W : PH_ADDR_R;
      idx = 0;
      go(0, now);
      return TWI_BUSY;
    case PH_ADDR_W:
    case PH_WRITE:
      // 0x18 SLA+W acked, 0x28 data acked (simavr 1.6 reports 0x28 for the address too); 0x20/0x30 NACK.
      if (st == 0x20 || st == 0x30) return finish(TWI_NACK);
      if (st != 0x18 && st != 0x28) break;
      if (idx < wlen) {
        TWDR = wbuf[idx++];
        phase = PH_WRITE;
        go(0, now);
        return TWI_BUSY;
      }
      if (!rlen) return finish(TWI_DONE);
      phase = PH_RESTART;
      go(_BV(TWSTA), now);
      return TWI_BUSY;
    case PH_ADDR_R:
      if (st == 0x48) return finish(TWI_NACK);
      if (st != 0x40) break;
      phase = PH_READ;
      read_next(now);
      return TWI_BUSY;
    case PH_READ:
      if (st != 0x50 && st != 0x58) break;
      rbuf[idx++] = TWDR;
      if (idx == rlen) return finish(TWI_DONE);
      read_next(now);
      return TWI_BUSY;
  }
  // Arbitration lost, bus error or a status out of sequence: give the bus up.
  off();
  return TWI_FAULT;
}
