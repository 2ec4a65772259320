// CRC-8/SMBUS (poly 0x07, init 0, not reflected, xorout 0): the protocol v1 line checksum.
#ifndef CRC8_H
#define CRC8_H

#include <stdint.h>

uint8_t crc8_update(uint8_t crc, uint8_t byte);
uint8_t crc8(const char *s, uint8_t n);

#endif
