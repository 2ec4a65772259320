// Host build of the firmware's formatter, CRC and command parser: reads one request per stdin line and
// prints the firmware's answer, so test/firmware can compare it with protocol/vectors.json and the TS codec.
//   crc <text to end of line>            -> crc as 2 hex digits
//   E <seq> <ch> <r|f> <ticks hex>        -> the E line
//   T <seq> <ticks hex> <lost hex> <levels hex>
//   H <seq> <boot hex> <rc hex | ->
//   Rok <seq> <cmd> <key> <value> <d|x>   (value in decimal, printed in decimal or hex)
//   Rerr <seq> <cmd> <reason>
//   A <seq> <ticks hex> <temp> <press> <hum>
//   S <seq> <state hex>
//   cmd <bytes as hex, LF excluded>       -> "<kind> <letter> <value> <reason|->"
//   bme <33 calibration bytes as hex (0x88..0xA1, 0xE1..0xE7)> <8 data bytes as hex (0xF7..0xFE)>
//                                         -> "<ok> <temp> <press> <hum>" (ok 0: a quantity was skipped)
#include <inttypes.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "command.h"
#include "bme280.h"
#include "crc8.h"
#include "report.h"

static ticks48_t ticks(uint64_t v) {
  ticks48_t t = {(uint32_t)(v >> 16), (uint16_t)v};
  return t;
}

static void print_line(const char *buf, uint8_t n) { fwrite(buf, 1, n, stdout); }

static void parse_command(const char *hex) {
  command_line_t acc;
  memset(&acc, 0, sizeof acc);
  command_t c;
  memset(&c, 0, sizeof c);
  uint8_t done = 0;
  for (size_t i = 0; hex[i] && hex[i + 1]; i += 2) {
    unsigned b;
    sscanf(hex + i, "%2x", &b);
    done = command_feed(&acc, (uint8_t)b, 3, &c);
  }
  done = command_feed(&acc, '\n', 3, &c);
  if (!done) {
    printf("none\n");
    return;
  }
  static const char *kinds[] = {"hello", "period", "channels", "air", "error"};
  printf("%s %c %u %s\n", kinds[c.kind], c.letter, c.value, c.kind == CMD_ERROR ? c.reason : "-");
}

static int unhex(const char *s, uint8_t *out, size_t n) {
  for (size_t i = 0; i < n; i++) {
    unsigned b;
    if (sscanf(s + 2 * i, "%2x", &b) != 1) return 0;
    out[i] = (uint8_t)b;
  }
  return s[2 * n] == 0;
}

static void compensate(const char *cal_hex, const char *data_hex) {
  uint8_t cal[BME280_CALIB_TP_LEN + BME280_CALIB_H_LEN], data[BME280_DATA_LEN];
  if (!unhex(cal_hex, cal, sizeof cal) || !unhex(data_hex, data, sizeof data)) {
    printf("bad request\n");
    return;
  }
  bme280_calib_t c;
  bme280_raw_t r;
  bme280_unpack_calib(&c, cal, cal + BME280_CALIB_TP_LEN);
  uint8_t ok = bme280_unpack_raw(&r, data);
  int32_t t_fine;
  int32_t t = bme280_temperature(&c, r.adc_t, &t_fine);
  printf("%u %ld %lu %lu\n", ok, (long)t, (unsigned long)bme280_pressure(&c, r.adc_p, t_fine),
         (unsigned long)bme280_humidity(&c, r.adc_h, t_fine));
}

int main(void) {
  char req[512];
  char buf[REPORT_MAX_LINE + 1];
  while (fgets(req, sizeof req, stdin)) {
    req[strcspn(req, "\n")] = 0;
    unsigned seq, ch, boot, levels;
    uint64_t t;
    unsigned long lost, value;
    char edge, cmd, key[32], reason[32], base, rc[8], hex[400], hex2[400];
    long temp;
    unsigned long press, hum;
    if (!strncmp(req, "crc ", 4)) {
      printf("%02x\n", crc8(req + 4, (uint8_t)strlen(req + 4)));
    } else if (sscanf(req, "E %x %u %c %" SCNx64, &seq, &ch, &edge, &t) == 4) {
      print_line(buf, report_edge(buf, (uint16_t)seq, (uint8_t)ch, edge == 'r', ticks(t)));
    } else if (sscanf(req, "T %x %" SCNx64 " %lx %x", &seq, &t, &lost, &levels) == 4) {
      print_line(buf, report_heartbeat(buf, (uint16_t)seq, ticks(t), (uint32_t)lost, (uint8_t)levels));
    } else if (sscanf(req, "H %x %x %7s", &seq, &boot, rc) == 3) {
      int8_t r = rc[0] == '-' ? -1 : (int8_t)strtol(rc, NULL, 16);
      print_line(buf, report_hello(buf, (uint16_t)seq, (uint16_t)boot, r));
    } else if (sscanf(req, "Rok %x %c %31s %lu %c", &seq, &cmd, key, &value, &base) == 5) {
      print_line(buf, report_ok(buf, (uint16_t)seq, cmd, key, (uint32_t)value, base == 'x'));
    } else if (sscanf(req, "Rerr %x %c %31s", &seq, &cmd, reason) == 3) {
      print_line(buf, report_err(buf, (uint16_t)seq, cmd, reason));
    } else if (sscanf(req, "A %x %" SCNx64 " %ld %lu %lu", &seq, &t, &temp, &press, &hum) == 5) {
      print_line(buf, report_air(buf, (uint16_t)seq, ticks(t), (int32_t)temp, (uint32_t)press, (uint32_t)hum));
    } else if (sscanf(req, "S %x %x", &seq, &levels) == 2) {
      print_line(buf, report_state(buf, (uint16_t)seq, (uint8_t)levels));
    } else if (sscanf(req, "bme %399s %399s", hex, hex2) == 2) {
      compensate(hex, hex2);
    } else if (sscanf(req, "cmd %399s", hex) == 1 || !strcmp(req, "cmd")) {
      parse_command(!strcmp(req, "cmd") ? "" : hex);
    } else {
      printf("bad request\n");
    }
    fflush(stdout);
  }
  return 0;
}
