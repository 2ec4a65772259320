// The room sensor (BME280 on TWI): a main-loop state machine that reads it every interval and tracks faults.
#ifndef ROOM_H
#define ROOM_H

#include <stdint.h>

#include "report.h"

// Bits of the S record's state (protocol/SPEC.md, section 4.6).
#define ROOM_ABSENT 0x01
#define ROOM_BUS 0x02
#define ROOM_CHIP 0x04
#define ROOM_OFF 0x08

#define ROOM_DEFAULT_S 10
#define ROOM_MAX_S 3600
// After a fault the sensor is tried again this often.
#define ROOM_RETRY_S 10

typedef struct {
  ticks48_t at;
  int32_t temp;   // hundredths of a degree Celsius
  uint32_t press; // pascals
  uint32_t hum;   // thousandths of a percent RH
} room_reading_t;

// Advances by at most one step (one bus step or one part of the compensation). Returns 1 if it did work.
uint8_t room_service(uint64_t now);
// For the main loop's timer wake-up: 1 and the low 16 bits of the tick at which the next step falls due (a
// reading, or the end of a measurement) when that lies in the present or the next Timer1 overflow period
// (now_hi: the present one's number, the tick count's upper 32 bits); 0 otherwise.
uint8_t room_wake_phase(uint32_t now_hi, uint16_t *lo);
// 1 while a step can run now (a transfer in progress or a computation waiting): the loop must not sleep.
uint8_t room_busy(void);
// Interval in seconds, 0 = off; takes effect at once.
void room_set_interval(uint16_t seconds, uint64_t now);
// A finished reading waiting to be sent; room_reading_sent() releases it.
const room_reading_t *room_reading(void);
void room_reading_sent(void);
// The state to report in an S record, or -1 when nothing needs saying (unchanged since the last one, or
// not yet known at boot). room_announce() asks for one, as after a hello.
int16_t room_state_due(void);
void room_state_sent(void);
void room_announce(void);

#endif
