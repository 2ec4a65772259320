// Constant strings in flash on the AVR, plain strings on the host build (the formatter is tested there too).
#ifndef FLASH_STRINGS_H
#define FLASH_STRINGS_H

#ifdef __AVR__
#include <avr/pgmspace.h>
#define FLASH_READ(p) pgm_read_byte(p)
#else
#define PROGMEM
#define PSTR(s) (s)
#define FLASH_READ(p) (*(const char *)(p))
#endif

#endif
