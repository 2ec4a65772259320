// System set-up. The reset cause is read in .init3, before the C runtime, so a watchdog reset cannot loop.
#include "system.h"

#include <avr/interrupt.h>
#include <avr/io.h>
#include <avr/power.h>
#include <avr/wdt.h>
#include <util/crc16.h>

#include "board.h"

// .noinit: kept across resets, never cleared by the C runtime.
static uint8_t saved_reset_cause __attribute__((section(".noinit")));
static uint8_t entropy_pool[16] __attribute__((section(".noinit")));
static volatile uint8_t wdt_ticked;
static volatile uint8_t wdt_sample;

// After a watchdog reset WDRF forces the watchdog on at its shortest timeout: clear WDRF and stop the
// watchdog before the C runtime spends time clearing RAM. Optiboot 8 clears MCUSR itself and hands the
// original value over in r2, so r2 is used when MCUSR reads 0.
void system_early_init(void) __attribute__((naked, used, section(".init3")));
void system_early_init(void) {
  uint8_t from_r2;
  __asm__ __volatile__("mov %0, r2" : "=r"(from_r2));
  uint8_t m = MCUSR;
  MCUSR = 0;
  wdt_disable();
  saved_reset_cause = (uint8_t)((m ? m : from_r2) & 0x0f);
}

uint8_t system_reset_cause(void) { return saved_reset_cause; }

void system_power_down_unused(void) {
  // INT0 in any-change mode before the pins are touched: the reset default (low level) makes simavr 1.6
  // poll the pin every cycle while it is low, which stops the emulator from skipping idle time.
  EICRA = _BV(ISC00);
  ACSR = _BV(ACD);  // analog comparator off
  ADCSRA = 0;
  power_adc_disable();
  power_spi_disable();
  power_twi_disable();
  power_timer0_disable();
  power_timer2_disable();
  // Unused pins: inputs with pull-ups, so they do not float. PD0/PD1 belong to the USART.
  DDRB = 0;
  DDRC = 0;
  DDRD = 0;
  PORTC = 0x7f;
  PORTB = (uint8_t)~_BV(CH0_BIT);
  PORTD = (uint8_t)~(_BV(CH1_BIT) | _BV(PD0) | _BV(PD1));
#if BOARD_INPUT_PULLUPS
  CH0_PORT |= _BV(CH0_BIT);
  CH1_PORT |= _BV(CH1_BIT);
#endif
}

ISR(WDT_vect) {
  wdt_sample = TCNT1L;
  wdt_ticked = 1;
}

// Entropy: the watchdog's own 128 kHz RC oscillator jitters against the CPU clock, so the low byte of
// Timer1 at a watchdog interrupt varies from boot to boot. Mixed with the power-up content of SRAM
// (.noinit), which is written back so that the next warm reset starts from a different state.
uint16_t system_boot_id(void) {
  uint16_t h = 0xffff;
  for (uint8_t i = 0; i < sizeof entropy_pool; i++) h = _crc_ccitt_update(h, entropy_pool[i]);
  for (uint8_t round = 0; round < 2; round++) {
    wdt_ticked = 0;
    uint8_t s = SREG;
    cli();
    wdt_reset();
    WDTCSR = _BV(WDCE) | _BV(WDE);
    WDTCSR = _BV(WDIE);  // interrupt mode, 16 ms
    SREG = s;
    // Give up after ~33 ms of Timer1 time, should the watchdog interrupt never come (an emulator without one).
    uint16_t waited = 0;
    uint16_t last = TCNT1;
    while (!wdt_ticked && waited < 8000) {
      uint16_t now = TCNT1;
      if ((uint16_t)(now - last) >= 64) {
        waited++;
        last = now;
      }
    }
    h = _crc_ccitt_update(h, wdt_sample);
  }
  wdt_disable();
  for (uint8_t i = 0; i < sizeof entropy_pool; i++) entropy_pool[i] ^= (uint8_t)(h >> (i & 8));
  entropy_pool[0] += 1;
  return h;
}

void system_watchdog_start(void) { wdt_enable(WDTO_1S); }

void system_watchdog_pet(void) { wdt_reset(); }
