// Host command lines (`?`, `P <ms>`, `C <hex mask>`, `A <s>`): assembly from received bytes and parsing. Pure.
#ifndef COMMAND_H
#define COMMAND_H

#include <stdint.h>

// Longest accepted command line before its LF, a CR included (protocol/SPEC.md, Commands); longer lines
// get `err <c> too-long`.
#define COMMAND_MAX_LINE 16
#define PERIOD_MIN_MS 100
#define PERIOD_MAX_MS 60000
// Room reading interval in seconds (command A); 0 switches the readings off.
#define AIR_MAX_S 3600

typedef enum { CMD_HELLO, CMD_PERIOD, CMD_CHANNELS, CMD_AIR, CMD_ERROR } command_kind_t;

typedef struct {
  command_kind_t kind;
  // Command letter as echoed in the reply, or '-' when the first byte is not printable.
  char letter;
  // CMD_PERIOD: milliseconds; CMD_CHANNELS: mask; CMD_AIR: seconds.
  uint16_t value;
  // CMD_ERROR: reason token, a flash string.
  const char *reason;
} command_t;

typedef struct {
  char buf[COMMAND_MAX_LINE];
  uint8_t len;
  uint8_t overflow;
} command_line_t;

// Feeds one received byte. Returns 1 when a non-empty line ended (LF) and *out holds its parse.
uint8_t command_feed(command_line_t *acc, uint8_t byte, uint8_t channel_mask_limit, command_t *out);

#endif
