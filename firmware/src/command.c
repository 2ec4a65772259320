// Command parsing: strict grammar, every malformed line gets a reason token (unknown, syntax, range, too-long).
#include "command.h"

#include "flash-strings.h"

static const char R_UNKNOWN[] PROGMEM = "unknown";
static const char R_SYNTAX[] PROGMEM = "syntax";
static const char R_RANGE[] PROGMEM = "range";
static const char R_TOO_LONG[] PROGMEM = "too-long";

static uint8_t printable(uint8_t c) { return c > 0x20 && c < 0x7f; }

static void fail(command_t *out, const char *reason) {
  out->kind = CMD_ERROR;
  out->reason = reason;
}

static int8_t digit_value(char c, uint8_t base) {
  if (c >= '0' && c <= '9') return (int8_t)(c - '0');
  if (base == 16 && c >= 'a' && c <= 'f') return (int8_t)(c - 'a' + 10);
  if (base == 16 && c >= 'A' && c <= 'F') return (int8_t)(c - 'A' + 10);
  return -1;
}

// Parses "<letter> <number>" into out->value; numbers saturate so huge values report `range`, not `syntax`.
static void parse_number(const char *s, uint8_t n, uint8_t base, uint32_t max, command_t *out) {
  if (n < 3 || s[1] != ' ') return fail(out, R_SYNTAX);
  uint32_t v = 0;
  for (uint8_t i = 2; i < n; i++) {
    int8_t d = digit_value(s[i], base);
    if (d < 0) return fail(out, R_SYNTAX);
    v = v * base + (uint8_t)d;
    if (v > 0xffffffUL) v = 0xffffffUL;
  }
  if (v > max) return fail(out, R_RANGE);
  out->value = (uint16_t)v;
}

static void parse(const char *s, uint8_t n, uint8_t mask_limit, command_t *out) {
  out->letter = printable((uint8_t)s[0]) ? s[0] : '-';
  switch (out->letter) {
    case '?':
      out->kind = CMD_HELLO;
      if (n != 1) fail(out, R_SYNTAX);
      return;
    case 'P':
      out->kind = CMD_PERIOD;
      parse_number(s, n, 10, PERIOD_MAX_MS, out);
      if (out->kind == CMD_PERIOD && out->value < PERIOD_MIN_MS) fail(out, R_RANGE);
      return;
    case 'C':
      out->kind = CMD_CHANNELS;
      parse_number(s, n, 16, mask_limit, out);
      return;
    case 'A':
      out->kind = CMD_AIR;
      parse_number(s, n, 10, AIR_MAX_S, out);
      return;
    default:
      fail(out, R_UNKNOWN);
  }
}

uint8_t command_feed(command_line_t *acc, uint8_t byte, uint8_t mask_limit, command_t *out) {
  if (byte != '\n') {
    if (acc->len < COMMAND_MAX_LINE)
      acc->buf[acc->len++] = (char)byte;
    else
      acc->overflow = 1;
    return 0;
  }
  uint8_t n = acc->len;
  uint8_t overflow = acc->overflow;
  acc->len = 0;
  acc->overflow = 0;
  if (overflow) {
    out->letter = printable((uint8_t)acc->buf[0]) ? acc->buf[0] : '-';
    fail(out, R_TOO_LONG);
    return 1;
  }
  if (n && acc->buf[n - 1] == '\r') n--;  // hosts that send CR LF
  if (n == 0) return 0;                   // empty lines are ignored
  parse(acc->buf, n, mask_limit, out);
  return 1;
}
