// Protocol v1 line formatting: canonical hex (no leading zeros), CRC-8/SMBUS over kind..last field, LF.
#include "report.h"

#include "board.h"
#include "config.h"
#include "crc8.h"
#include "flash-strings.h"

typedef struct {
  char *buf;
  uint8_t len;
} line_t;

static void put_c(line_t *l, char c) { l->buf[l->len++] = c; }

static void put_flash(line_t *l, const char *s) {
  for (char c; (c = (char)FLASH_READ(s)) != 0; s++) put_c(l, c);
}

static char hex_digit(uint8_t v) { return (char)(v < 10 ? '0' + v : 'a' + v - 10); }

// Exactly `digits` hex digits (leading zeros kept).
static void put_hex_fixed(line_t *l, uint32_t v, uint8_t digits) {
  while (digits--) put_c(l, hex_digit((uint8_t)(v >> (4 * digits)) & 0xf));
}

// Canonical hex: no leading zeros, a single 0 for zero.
static void put_hex(line_t *l, uint32_t v) {
  uint8_t digits = 1;
  for (uint32_t x = v >> 4; x; x >>= 4) digits++;
  put_hex_fixed(l, v, digits);
}

static void put_dec(line_t *l, uint32_t v) {
  char tmp[10];
  uint8_t n = 0;
  do {
    tmp[n++] = (char)('0' + v % 10);
    v /= 10;
  } while (v);
  while (n) put_c(l, tmp[--n]);
}

static void put_ticks(line_t *l, ticks48_t t) {
  if (t.hi) {
    put_hex(l, t.hi);
    put_hex_fixed(l, t.lo, 4);
  } else {
    put_hex(l, t.lo);
  }
}

// Kind letter and sequence number open every line.
static void begin(line_t *l, char *buf, char kind, uint16_t seq) {
  l->buf = buf;
  l->len = 0;
  put_c(l, kind);
  put_c(l, ' ');
  put_hex(l, seq);
}

static uint8_t finish(line_t *l) {
  uint8_t c = crc8(l->buf, l->len);
  put_c(l, ' ');
  put_c(l, '*');
  put_hex_fixed(l, c, 2);
  put_c(l, '\n');
  return l->len;
}

uint8_t report_edge(char *buf, uint16_t seq, uint8_t ch, uint8_t rising, ticks48_t t) {
  line_t l;
  begin(&l, buf, 'E', seq);
  put_c(&l, ' ');
  put_c(&l, hex_digit(ch & 7));
  put_c(&l, ' ');
  put_c(&l, rising ? 'r' : 'f');
  put_c(&l, ' ');
  put_ticks(&l, t);
  return finish(&l);
}

uint8_t report_heartbeat(char *buf, uint16_t seq, ticks48_t t, uint32_t lost, uint8_t levels) {
  line_t l;
  begin(&l, buf, 'T', seq);
  put_c(&l, ' ');
  put_ticks(&l, t);
  put_c(&l, ' ');
  put_hex(&l, lost);
  put_c(&l, ' ');
  put_hex(&l, levels);
  return finish(&l);
}

static const char HELLO_MIDDLE[] PROGMEM = " halfswing proto=1 fw=" FW_VERSION " mcu=" BOARD_MCU_NAME " hz=";
static const char HELLO_CH[] PROGMEM = " ch=";
static const char HELLO_BOOT[] PROGMEM = " boot=";
static const char HELLO_RC[] PROGMEM = " rc=";

uint8_t report_hello(char *buf, uint16_t seq, uint16_t boot, int8_t rc) {
  line_t l;
  begin(&l, buf, 'H', seq);
  put_flash(&l, HELLO_MIDDLE);
  put_dec(&l, F_CPU);
  put_flash(&l, HELLO_CH);
  put_dec(&l, BOARD_CHANNELS);
  put_flash(&l, HELLO_BOOT);
  put_hex_fixed(&l, boot, 4);
  if (rc >= 0) {
    put_flash(&l, HELLO_RC);
    put_c(&l, hex_digit((uint8_t)rc & 0xf));
  }
  return finish(&l);
}

static const char REPLY_OK[] PROGMEM = " ok ";
static const char REPLY_ERR[] PROGMEM = " err ";

uint8_t report_ok(char *buf, uint16_t seq, char cmd, const char *key_flash, uint32_t value, uint8_t hex) {
  line_t l;
  begin(&l, buf, 'R', seq);
  put_flash(&l, REPLY_OK);
  put_c(&l, cmd);
  put_c(&l, ' ');
  put_flash(&l, key_flash);
  put_c(&l, '=');
  if (hex)
    put_hex(&l, value);
  else
    put_dec(&l, value);
  return finish(&l);
}

uint8_t report_err(char *buf, uint16_t seq, char cmd, const char *reason_flash) {
  line_t l;
  begin(&l, buf, 'R', seq);
  put_flash(&l, REPLY_ERR);
  put_c(&l, cmd);
  put_c(&l, ' ');
  put_flash(&l, reason_flash);
  return finish(&l);
}

uint8_t report_air(char *buf, uint16_t seq, ticks48_t t, int32_t temp, uint32_t press, uint32_t hum) {
  line_t l;
  begin(&l, buf, 'A', seq);
  put_c(&l, ' ');
  put_ticks(&l, t);
  put_c(&l, ' ');
  if (temp < 0) put_c(&l, '-');
  put_dec(&l, (uint32_t)(temp < 0 ? -temp : temp));
  put_c(&l, ' ');
  put_dec(&l, press);
  put_c(&l, ' ');
  put_dec(&l, hum);
  return finish(&l);
}

uint8_t report_state(char *buf, uint16_t seq, uint8_t state) {
  line_t l;
  begin(&l, buf, 'S', seq);
  put_c(&l, ' ');
  put_hex(&l, state);
  return finish(&l);
}
