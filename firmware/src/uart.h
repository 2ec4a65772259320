// USART0: interrupt-driven transmit ring (never blocks) and receive ring.
#ifndef UART_H
#define UART_H

#include <stdint.h>

#include "config.h"

// The rings' indices, for the inline checks below: the main loop's idle check runs them with interrupts off,
// where each cycle can hold up an edge's vector (a call and return alone take 8).
extern volatile uint8_t uart_tx_head, uart_tx_tail, uart_rx_head, uart_rx_tail;

void uart_init(void);
// Bytes the transmit ring can take now.
static inline uint8_t uart_tx_free(void) { return (uint8_t)((TX_RING_SIZE - 1) - ((uart_tx_head - uart_tx_tail) & (TX_RING_SIZE - 1))); }
// Queues n bytes; the caller has checked uart_tx_free() >= n.
void uart_write(const char *s, uint8_t n);
// Takes one received byte; returns 0 when none is waiting.
uint8_t uart_read(uint8_t *byte);
static inline uint8_t uart_rx_pending(void) { return uart_rx_head != uart_rx_tail; }

#endif
