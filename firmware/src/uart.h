// USART0: interrupt-driven transmit ring (never blocks) and receive ring.
#ifndef UART_H
#define UART_H

#include <stdint.h>

void uart_init(void);
// Bytes the transmit ring can take now.
uint8_t uart_tx_free(void);
// Queues n bytes; the caller has checked uart_tx_free() >= n.
void uart_write(const char *s, uint8_t n);
// Takes one received byte; returns 0 when none is waiting.
uint8_t uart_read(uint8_t *byte);
uint8_t uart_rx_pending(void);

#endif
