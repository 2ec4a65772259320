// CRC-8/SMBUS, bitwise: 20 bytes of flash instead of a 256-byte table; a line costs about 2 µs per byte.
#include "crc8.h"

uint8_t crc8_update(uint8_t crc, uint8_t byte) {
  crc ^= byte;
  for (uint8_t i = 0; i < 8; i++) crc = (crc & 0x80) ? (uint8_t)((crc << 1) ^ 0x07) : (uint8_t)(crc << 1);
  return crc;
}

uint8_t crc8(const char *s, uint8_t n) {
  uint8_t c = 0;
  for (uint8_t i = 0; i < n; i++) c = crc8_update(c, (uint8_t)s[i]);
  return c;
}
