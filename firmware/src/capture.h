// Edge capture: Timer1 as a 48-bit tick counter, ch0 by input capture (ICP1), ch1 by INT0, both into one ring.
#ifndef CAPTURE_H
#define CAPTURE_H

#include <stdint.h>

#include "report.h"

typedef struct {
  uint16_t lo;
  uint32_t hi;
  // bit 0: channel, bit 7: rising edge.
  uint8_t flags;
} edge_t;

#define EDGE_CH_MASK 0x01
#define EDGE_RISING 0x80

// Starts Timer1 at the CPU clock (tick 0 of the device's time) with its overflow interrupt. Channels stay off.
void capture_init(void);
// Enables the channels in mask (bit n = channel n); an enabled channel starts from its present pin level.
void capture_set_mask(uint8_t mask);
// Takes the oldest edge; returns 0 when the ring is empty.
uint8_t capture_pop(edge_t *e);
// The ring's indices (head by the ISRs, tail by main), for the inline check: see uart.h.
extern volatile uint8_t capture_ring_head, capture_ring_tail;
static inline uint8_t capture_pending(void) { return capture_ring_head != capture_ring_tail; }
// Present tick count (callable with interrupts on or off).
ticks48_t capture_now(void);
// Edges dropped since boot: ring full, or a pulse too short for the edge-select flip.
uint32_t capture_lost(void);
// Present input levels: bit 0 = ch0, bit 1 = ch1.
uint8_t capture_levels(void);
// Arms the Timer1 compare-A wake-up at this low 16-bit tick value (it fires every 4.096 ms at that phase).
void capture_set_alarm(uint16_t lo);
// Arms (on = 1) or disarms the Timer1 compare-B wake-up at this low 16-bit tick value, as compare-A.
void capture_set_wake(uint16_t lo, uint8_t on);
// Set by the compare-A and compare-B interrupts; the main loop clears it.
extern volatile uint8_t capture_alarm_flag;

#endif
