// Protocol v1 line formatting (protocol/SPEC.md): pure functions, no hardware, built for the AVR and the host.
#ifndef REPORT_H
#define REPORT_H

#include <stdint.h>

// Worst-case lengths, LF included: the main loop formats a line only when the UART ring has this much room.
#define REPORT_MAX_LINE 80
#define REPORT_MAX_EDGE 28      // "E ffff 1 r ffffffffffff *hh\n"
#define REPORT_MAX_HEARTBEAT 36 // "T ffff ffffffffffff ffffffff ff *hh\n"
#define REPORT_MAX_REPLY 32
#define REPORT_MAX_AIR 46       // "A ffff ffffffffffff -99999 9999999 100000 *hh\n"
#define REPORT_MAX_STATE 13     // "S ffff ff *hh\n"

// Ticks since boot: 32-bit overflow count above the 16-bit Timer1 value (48 bits in all).
typedef struct {
  uint32_t hi;
  uint16_t lo;
} ticks48_t;

// Each function writes one complete line (checksum and LF included) into buf and returns its length.
uint8_t report_edge(char *buf, uint16_t seq, uint8_t ch, uint8_t rising, ticks48_t t);
uint8_t report_heartbeat(char *buf, uint16_t seq, ticks48_t t, uint32_t lost, uint8_t levels);
// rc < 0 leaves the optional reset-cause field out.
uint8_t report_hello(char *buf, uint16_t seq, uint16_t boot, int8_t rc);
// "R <seq> ok <cmd> <key>=<value>", value in hex when hex != 0, else decimal.
uint8_t report_ok(char *buf, uint16_t seq, char cmd, const char *key_flash, uint32_t value, uint8_t hex);
// "A <seq> <ticks> <temp> <press> <hum>": hundredths of °C, Pa, thousandths of %RH, all decimal.
uint8_t report_air(char *buf, uint16_t seq, ticks48_t t, int32_t temp, uint32_t press, uint32_t hum);
// "S <seq> <state>", state in hex.
uint8_t report_state(char *buf, uint16_t seq, uint8_t state);
uint8_t report_err(char *buf, uint16_t seq, char cmd, const char *reason_flash);

#endif
