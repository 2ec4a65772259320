// Build options of the firmware: baud rate, buffer sizes, version. Override with make BAUD=... etc.
#ifndef CONFIG_H
#define CONFIG_H

#include "board.h"

// Firmware version in the hello line: at most 5 characters, so the hello line fits 80 bytes at seq ffff.
#ifndef FW_VERSION
#define FW_VERSION "0.1.0"
#endif

// Serial rate. 250000 is exact at 16 MHz (UBRR = 3, U2X = 0), 115200 is 2.1 % off; see hardware-notes/firmware.md.
#ifndef BAUD
#define BAUD 250000UL
#endif

// Edge ring: power of two, at most 128 (8-bit indices). 7 bytes per entry.
#ifndef EDGE_RING_SIZE
#define EDGE_RING_SIZE 64
#endif
// UART transmit ring: power of two, at most 128.
#ifndef TX_RING_SIZE
#define TX_RING_SIZE 128
#endif
// UART receive ring: power of two, at most 128.
#ifndef RX_RING_SIZE
#define RX_RING_SIZE 32
#endif

// Default heartbeat period in milliseconds (command P changes it at run time).
#define HEARTBEAT_DEFAULT_MS 1000

#if (EDGE_RING_SIZE & (EDGE_RING_SIZE - 1)) || EDGE_RING_SIZE > 128
#error "EDGE_RING_SIZE must be a power of two, at most 128"
#endif
#if (TX_RING_SIZE & (TX_RING_SIZE - 1)) || TX_RING_SIZE > 128 || TX_RING_SIZE < 128
#error "TX_RING_SIZE must be 128: a hello line (80 bytes) must fit with room to spare"
#endif
#if (RX_RING_SIZE & (RX_RING_SIZE - 1)) || RX_RING_SIZE > 128
#error "RX_RING_SIZE must be a power of two, at most 128"
#endif

#endif
