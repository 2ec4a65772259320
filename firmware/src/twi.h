// TWI (I²C) master on A4/A5, driven from the main loop by polling: no interrupt, never waits.
#ifndef TWI_H
#define TWI_H

#include <stdint.h>

typedef enum { TWI_BUSY, TWI_DONE, TWI_NACK, TWI_FAULT } twi_result_t;

// Starts a transfer to the 7-bit address: writes wn bytes, then (repeated start) reads rn bytes into r.
// The buffers must stay valid until twi_poll() stops answering TWI_BUSY. Returns TWI_FAULT at once, with
// the module off, when SDA or SCL is held low.
twi_result_t twi_begin(uint8_t addr, const uint8_t *w, uint8_t wn, uint8_t *r, uint8_t rn, uint64_t now);
// Advances the transfer by at most one bus step. TWI_FAULT: a step took over TWI_STEP_TICKS, or the bus
// reported an error; the module is switched off (pins released) and is switched on again by twi_begin.
twi_result_t twi_poll(uint64_t now);

#endif
