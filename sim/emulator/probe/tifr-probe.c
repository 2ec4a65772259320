// Harness self-test program: does writing one flag bit to TIFRn clear only that bit (silicon) or all (simavr 1.6)?
// For each timer n it lets TOVn and OCFnA both become pending, writes TIFRn = _BV(OCFnA), and prints
// "t<n> <TIFRn & (TOVn|OCFnA) as 2 hex digits>" on the UART at 250000 baud. Silicon answers 01 (TOV kept).
// Then the same for EIFR with INTF0 and INTF1 ("e <EIFR & 3>"; silicon: 01), raised by toggling PD2/PD3
// as outputs with both external interrupts in any-change mode and disabled.
#include <avr/io.h>
#include <stdint.h>

static void put(char c) {
  while (!(UCSR0A & _BV(UDRE0))) {
  }
  UDR0 = c;
}

static void report(uint8_t n, uint8_t v) {
  static const char hex[] = "0123456789abcdef";
  put('t');
  put((char)('0' + n));
  put(' ');
  put(hex[v >> 4]);
  put(hex[v & 15]);
  put('\n');
}

int main(void) {
  UBRR0 = 3;  // 250000 baud at 16 MHz
  UCSR0B = _BV(TXEN0);
  UCSR0C = _BV(UCSZ01) | _BV(UCSZ00);

  OCR0A = 10;
  TIFR0 = 0xff;
  TCCR0B = _BV(CS00);
  while ((TIFR0 & (_BV(TOV0) | _BV(OCF0A))) != (_BV(TOV0) | _BV(OCF0A))) {
  }
  TIFR0 = _BV(OCF0A);
  report(0, TIFR0 & (_BV(TOV0) | _BV(OCF0A)));

  OCR1A = 10;
  TIFR1 = 0xff;
  TCCR1B = _BV(CS10);
  while ((TIFR1 & (_BV(TOV1) | _BV(OCF1A))) != (_BV(TOV1) | _BV(OCF1A))) {
  }
  TIFR1 = _BV(OCF1A);
  report(1, TIFR1 & (_BV(TOV1) | _BV(OCF1A)));

  OCR2A = 10;
  TIFR2 = 0xff;
  TCCR2B = _BV(CS20);
  while ((TIFR2 & (_BV(TOV2) | _BV(OCF2A))) != (_BV(TOV2) | _BV(OCF2A))) {
  }
  TIFR2 = _BV(OCF2A);
  report(2, TIFR2 & (_BV(TOV2) | _BV(OCF2A)));

  EICRA = _BV(ISC00) | _BV(ISC10);
  EIFR = _BV(INTF0) | _BV(INTF1);
  DDRD = _BV(PD2) | _BV(PD3);
  PORTD = _BV(PD2) | _BV(PD3);
  while ((EIFR & 3) != 3) {
  }
  EIFR = _BV(INTF1);
  uint8_t e = EIFR & 3;
  put('e');
  put(' ');
  put('0');
  put((char)('0' + e));
  put('\n');
  for (;;) {
  }
}
