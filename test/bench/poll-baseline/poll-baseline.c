// Benchmark baseline only: a polling-loop edge timer as a hobby sketch would write it (not the product firmware).
//
// It reads a microsecond counter the way the usual Arduino core builds one (Timer0 at clk/64, so 4 µs
// steps, plus an overflow count kept by an interrupt every 1.024 ms), polls PB0 (ch 0) and PD2 (ch 1) in a
// loop, and prints each change with a blocking UART write, so edges that come while it prints are missed
// without notice. Lines use protocol v1 (hz=1000000, ticks in µs) only so that the same host decoder reads
// both firmwares; the timing method is what differs.
#include <avr/interrupt.h>
#include <avr/io.h>
#include <stdint.h>

// The UART is set up exactly as the product firmware sets it (the benchmark reads its UBRR0 and U2X0).
#if !defined(UBRR_VALUE) || !defined(USE_U2X)
#error "build with -DUBRR_VALUE=<n> -DUSE_U2X=<0|1>, the product firmware's UART settings"
#endif

static volatile uint32_t timer0_overflows;

ISR(TIMER0_OVF_vect) { timer0_overflows++; }

// The Arduino core's micros(): overflow count and TCNT0 read with interrupts off, plus the pending-overflow fix.
static uint32_t micros(void) {
  uint8_t sreg = SREG;
  cli();
  uint32_t m = timer0_overflows;
  uint8_t t = TCNT0;
  if ((TIFR0 & _BV(TOV0)) && t < 255) m++;
  SREG = sreg;
  return ((m << 8) + t) * (64 / (F_CPU / 1000000UL));
}

static uint8_t crc;

static void put(char c) {
  while (!(UCSR0A & _BV(UDRE0))) {
  }
  UDR0 = (uint8_t)c;
}

// CRC-8/SMBUS (poly 0x07, init 0) over the body, as protocol/SPEC.md requires.
static void putc_crc(char c) {
  put(c);
  crc ^= (uint8_t)c;
  for (uint8_t i = 0; i < 8; i++) crc = (uint8_t)((crc & 0x80) ? (crc << 1) ^ 0x07 : crc << 1);
}

static void puts_crc(const char *s) {
  while (*s) putc_crc(*s++);
}

static void puthex_crc(uint32_t v) {
  char buf[8];
  uint8_t n = 0;
  do {
    uint8_t d = v & 0xf;
    buf[n++] = (char)(d < 10 ? '0' + d : 'a' + d - 10);
    v >>= 4;
  } while (v);
  while (n) putc_crc(buf[--n]);
}

static void end_line(void) {
  static const char digits[] = "0123456789abcdef";
  put(' ');
  put('*');
  put(digits[crc >> 4]);
  put(digits[crc & 0xf]);
  put('\n');
  crc = 0;
}

static uint16_t seq;

static void edge_line(uint8_t ch, uint8_t level, uint32_t us) {
  puts_crc("E ");
  puthex_crc(seq++);
  putc_crc(' ');
  putc_crc((char)('0' + ch));
  puts_crc(level ? " r " : " f ");
  puthex_crc(us);
  end_line();
}

static void uart_init(void) {
  UBRR0H = (uint8_t)(UBRR_VALUE >> 8);
  UBRR0L = (uint8_t)UBRR_VALUE;
  UCSR0A = USE_U2X ? _BV(U2X0) : 0;
  UCSR0B = _BV(TXEN0);
  UCSR0C = _BV(UCSZ01) | _BV(UCSZ00);
}

int main(void) {
  TCCR0A = 0;
  TCCR0B = _BV(CS01) | _BV(CS00);
  TIMSK0 = _BV(TOIE0);
  uart_init();
  sei();
  puts_crc("H 0 halfswing proto=1 fw=poll-baseline mcu=m328p hz=1000000 ch=2 boot=0000");
  end_line();
  seq = 1;
  uint8_t last0 = PINB & _BV(PINB0) ? 1 : 0;
  uint8_t last1 = PIND & _BV(PIND2) ? 1 : 0;
  for (;;) {
    uint8_t now0 = PINB & _BV(PINB0) ? 1 : 0;
    uint8_t now1 = PIND & _BV(PIND2) ? 1 : 0;
    if (now0 != last0) {
      edge_line(0, now0, micros());
      last0 = now0;
    }
    if (now1 != last1) {
      edge_line(1, now1, micros());
      last1 = now1;
    }
  }
}
