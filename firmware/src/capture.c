// Capture ISRs. Ch0: the hardware latches TCNT1 into ICR1 on the edge; ch1: INT0 reads TCNT1 in software.
#include "capture.h"

#include <avr/interrupt.h>
#include <avr/io.h>

#include "board.h"
#include "config.h"

#define RING_MASK (EDGE_RING_SIZE - 1)

// TCCR1B with the capture edge select cleared / set; the rest never changes after capture_init.
#define TCCR1B_FALLING (_BV(ICNC1) | _BV(CS10))
#define TCCR1B_RISING (_BV(ICNC1) | _BV(ICES1) | _BV(CS10))

static edge_t ring[EDGE_RING_SIZE];
// Single producer (the capture ISRs, which never nest) and single consumer (main): head by ISR, tail by main.
volatile uint8_t capture_ring_head;
volatile uint8_t capture_ring_tail;
static volatile uint32_t overflows;
static volatile uint32_t lost;
static uint8_t ch1_level;
// TCNT1 as read by the first instructions of the INT0 vector.
static volatile uint16_t ch1_stamp;
volatile uint8_t capture_alarm_flag;

static inline __attribute__((always_inline)) void ring_push(uint8_t flags, uint16_t lo, uint32_t hi) {
  uint8_t h = capture_ring_head;
  uint8_t next = (uint8_t)((h + 1) & RING_MASK);
  if (next == capture_ring_tail) {
    lost++;
    return;
  }
  ring[h].lo = lo;
  ring[h].hi = hi;
  ring[h].flags = flags;
  capture_ring_head = next;
}

// Upper 32 bits for a 16-bit Timer1 value taken with interrupts off. TOV1 still pending means the
// overflow ISR has not counted it yet; a small value was then taken after that overflow, a large
// one before it (valid while the value is read within 32768 ticks of being latched).
static inline __attribute__((always_inline)) uint32_t upper_bits(uint16_t lo) {
  uint32_t hi = overflows;
  if ((TIFR1 & _BV(TOV1)) && !(lo & 0x8000)) hi++;
  return hi;
}

void capture_init(void) {
  TCCR1A = 0;                  // normal mode, compare outputs disconnected
  TIMSK1 = _BV(TOIE1);         // overflow counting; capture and compare-A are enabled later
  TIFR1 = _BV(TOV1) | _BV(ICF1) | _BV(OCF1A) | _BV(OCF1B);
  TCCR1B = TCCR1B_FALLING;  // noise canceler on, prescaler 1: 62.5 ns ticks at 16 MHz
}

void capture_set_mask(uint8_t mask) {
  uint8_t s = SREG;
  cli();
  if (mask & 1) {
    // Await the edge that leaves the present level; clear the flag the edge-select write may set.
    if (CH0_PIN & _BV(CH0_BIT))
      TCCR1B &= (uint8_t)~_BV(ICES1);
    else
      TCCR1B |= _BV(ICES1);
    TIFR1 = _BV(ICF1);
    TIMSK1 |= _BV(ICIE1);
  } else {
    TIMSK1 &= (uint8_t)~_BV(ICIE1);
  }
  if (mask & 2) {
    ch1_level = CH1_PIN & _BV(CH1_BIT);
    EICRA = _BV(ISC00);  // any logical change on INT0
    EIFR = _BV(INTF0);
    EIMSK |= _BV(INT0);
  } else {
    EIMSK &= (uint8_t)~_BV(INT0);
  }
  SREG = s;
}

uint8_t capture_pop(edge_t *e) {
  uint8_t t = capture_ring_tail;
  if (t == capture_ring_head) return 0;
  *e = ring[t];
  capture_ring_tail = (uint8_t)((t + 1) & RING_MASK);
  return 1;
}

ticks48_t capture_now(void) {
  ticks48_t t;
  uint8_t s = SREG;
  cli();
  t.lo = TCNT1;
  t.hi = upper_bits(t.lo);
  SREG = s;
  return t;
}

uint32_t capture_lost(void) {
  uint8_t s = SREG;
  cli();
  uint32_t n = lost;
  SREG = s;
  return n;
}

uint8_t capture_levels(void) {
  return (uint8_t)(((CH0_PIN >> CH0_BIT) & 1) | (((CH1_PIN >> CH1_BIT) & 1) << 1));
}

void capture_set_alarm(uint16_t lo) {
  uint8_t s = SREG;
  cli();
  OCR1A = lo;
  TIFR1 = _BV(OCF1A);
  TIMSK1 |= _BV(OCIE1A);
  SREG = s;
}

void capture_set_wake(uint16_t lo, uint8_t on) {
  uint8_t s = SREG;
  cli();
  OCR1B = lo;
  TIFR1 = _BV(OCF1B);
  if (on)
    TIMSK1 |= _BV(OCIE1B);
  else
    TIMSK1 &= (uint8_t)~_BV(OCIE1B);
  SREG = s;
}

// ICR1, TCCR1B and TCNT1 as the first instructions of the capture vector found them (the TCNT1 value is
// read just after the edge-select flip). GPIOR0 carries two more samples from those instructions.
static volatile uint16_t ch0_icr;
static volatile uint8_t ch0_sense;
static volatile uint16_t ch0_flip;
// GPIOR0 bits set by the vector: another capture (old edge select) came between the ICR1 read and the flip;
// the pin read high one cycle after the flip.
#define SEEN_RECAPTURE 0
#define SEEN_HIGH 1
// A capture this many ticks or fewer after the TCNT1 read that follows the flip is the edge the pin sample
// already showed: the capture path lags the pin by the noise canceler's 4 cycles (datasheet), simavr by 0.
#define FLIP_CAPTURE_WINDOW 4

// The edge-select flip must beat the pulse's next edge, so the vector does it in its first instructions,
// before the C prologue (none of them touches SREG): read ICR1, save the edge select, note a capture that
// came since the vector cleared ICF1, write the opposite select, clear the flag the write may raise, then
// sample the pin and TCNT1 at once. The ordinary handler below then judges from those samples.
void __vector_capt_body(void) __attribute__((signal, used));
ISR(TIMER1_CAPT_vect, ISR_NAKED) {
  __asm__ __volatile__(
      "push r24\n\t"
      "lds r24, %[icr_lo]\n\t"  // reading the low byte latches the high byte
      "sts %[icr], r24\n\t"
      "lds r24, %[icr_hi]\n\t"
      "sts %[icr]+1, r24\n\t"
      "lds r24, %[tccr]\n\t"
      "sts %[sense], r24\n\t"
      "sbrc r24, %[ices]\n\t"
      "rjmp 1f\n\t"
      "ldi r24, %[rising]\n\t"
      "rjmp 2f\n"
      "1:\tldi r24, %[falling]\n"
      "2:\tsbic %[tifr], %[icf_bit]\n\t"
      "sbi %[seen], %[recap]\n\t"
      "sts %[tccr], r24\n\t"
      "ldi r24, %[icf]\n\t"
      "out %[tifr], r24\n\t"
      "sbic %[pin], %[pin_bit]\n\t"
      "sbi %[seen], %[high]\n\t"
      "lds r24, %[tcnt_lo]\n\t"
      "sts %[flip], r24\n\t"
      "lds r24, %[tcnt_hi]\n\t"
      "sts %[flip]+1, r24\n\t"
      "pop r24\n\t"
      "jmp __vector_capt_body\n\t" ::[icr_lo] "i"(_SFR_MEM_ADDR(ICR1L)),
      [icr_hi] "i"(_SFR_MEM_ADDR(ICR1H)), [icr] "i"(&ch0_icr), [tccr] "i"(_SFR_MEM_ADDR(TCCR1B)),
      [sense] "i"(&ch0_sense), [ices] "I"(ICES1), [rising] "M"(TCCR1B_RISING), [falling] "M"(TCCR1B_FALLING),
      [icf] "M"(_BV(ICF1)), [icf_bit] "I"(ICF1), [tifr] "I"(_SFR_IO_ADDR(TIFR1)), [seen] "I"(_SFR_IO_ADDR(GPIOR0)),
      [recap] "I"(SEEN_RECAPTURE), [high] "I"(SEEN_HIGH), [pin] "I"(_SFR_IO_ADDR(CH0_PIN)), [pin_bit] "I"(CH0_BIT),
      [tcnt_lo] "i"(_SFR_MEM_ADDR(TCNT1L)), [tcnt_hi] "i"(_SFR_MEM_ADDR(TCNT1H)), [flip] "i"(&ch0_flip));
}

void __vector_capt_body(void) {
  uint8_t seen = GPIOR0;
  GPIOR0 = 0;
  uint8_t rose = ch0_sense & _BV(ICES1);
  // A capture at the old select after ICR1 was read: that edge and the one between (which let the pin
  // come back) were never timestamped. The pin then sits at this edge's level again.
  if (seen & _BV(SEEN_RECAPTURE)) lost += 2;
  // One cycle after the flip the pin must still show the level this edge left. If not, the next edge came
  // first. Captured after the flip (ICF1, ICR1 at the flip): nothing lost, this ISR runs again for it.
  // Not captured: lost, and re-arm for the edge after it. Captured much later: that capture is a third
  // edge, and the one before it was not seen either.
  if (((seen & _BV(SEEN_HIGH)) != 0) != (rose != 0)) {
    if (!(TIFR1 & _BV(ICF1))) {
      lost++;
      TCCR1B ^= _BV(ICES1);
      TIFR1 = _BV(ICF1);
    } else if ((int16_t)(ICR1 - ch0_flip) > FLIP_CAPTURE_WINDOW) {
      lost += 2;
    }
  }
  uint16_t lo = ch0_icr;
  ring_push(rose ? EDGE_RISING : 0, lo, upper_bits(lo));
  // Live re-check for edges while this handler ran: the pin must match what the edge select awaits.
  for (uint8_t tries = 0; tries < 3; tries++) {
    uint8_t high = CH0_PIN & _BV(CH0_BIT);
    uint8_t awaiting_rise = TCCR1B & _BV(ICES1);
    if ((high != 0) != (awaiting_rise != 0)) break;
    // The pin path is a few cycles ahead of the capture path (noise canceler): give a real capture
    // time to set ICF1; if it does, this ISR runs again for it and nothing was lost.
    __builtin_avr_delay_cycles(8);
    if (TIFR1 & _BV(ICF1)) break;
    lost++;
    TCCR1B ^= _BV(ICES1);
    TIFR1 = _BV(ICF1);
  }
}

// Ch1 has one flag (INTF0) and the pin level to go by, so the vector samples both in its first instructions,
// in adjacent cycles, and clears the flag in the next, before it reads TCNT1 and the C prologue saves
// registers (push, in, out, sbi, lds and sts leave SREG alone). Any change after the entry (which clears
// INTF0) and before the flag sample is then in both samples; one between the two samples is in the level
// only; one between the level sample and the clear is in neither, and the next change counts it. Only two
// changes in that two-cycle span, or three before the vector's entry, go uncounted (firmware/README.md).
// The samples travel in GPIOR1 and GPIOR2, which nothing else uses. SBI on EIFR writes INTF0 only (the
// 328P's SBI and CBI touch only the named bit, datasheet "Register Description"; INT1 is unused anyway).
void __vector_int0_body(void) __attribute__((signal, used));
ISR(INT0_vect, ISR_NAKED) {
  __asm__ __volatile__(
      "push r24\n\t"
      "push r25\n\t"
      "in r24, %[eifr]\n\t"
      "in r25, %[pin]\n\t"
      "sbi %[eifr], %[intf]\n\t"
      "out %[flags], r24\n\t"
      "lds r24, %[tcnt_lo]\n\t"  // reading the low byte latches the high byte
      "out %[levels], r25\n\t"
      "sts %[stamp], r24\n\t"
      "lds r24, %[tcnt_hi]\n\t"
      "sts %[stamp]+1, r24\n\t"
      "pop r25\n\t"
      "pop r24\n\t"
      "jmp __vector_int0_body\n\t" ::[eifr] "I"(_SFR_IO_ADDR(EIFR)),
      [pin] "I"(_SFR_IO_ADDR(CH1_PIN)), [intf] "I"(INTF0), [flags] "I"(_SFR_IO_ADDR(GPIOR1)),
      [levels] "I"(_SFR_IO_ADDR(GPIOR2)), [tcnt_lo] "i"(_SFR_MEM_ADDR(TCNT1L)), [tcnt_hi] "i"(_SFR_MEM_ADDR(TCNT1H)),
      [stamp] "i"(&ch1_stamp));
}

void __vector_int0_body(void) {
  uint16_t lo = ch1_stamp;
  uint8_t again = GPIOR1 & _BV(INTF0);
  uint8_t level = GPIOR2 & _BV(CH1_BIT);
  uint32_t hi = upper_bits(lo);
  if (level != ch1_level) {
    ch1_level = level;
    ring_push(1 | (level ? EDGE_RISING : 0), lo, hi);
    // The level moved an odd number of times, and more than once if a change came after the entry: the
    // first is the one stamped, and two more went by unseen.
    if (again) lost += 2;
  } else {
    // An even number of changes since the last look (two, unless more came very close): both are lost.
    lost += 2;
  }
}

// The overflow count, by hand: 34 cycles with entry and RETI, against 57 for the compiler's version. Every
// cycle here can delay a capture ISR, and so the edge-select flip of a short pulse.
ISR(TIMER1_OVF_vect, ISR_NAKED) {
  __asm__ __volatile__(
      "push r24\n\t"
      "in r24, __SREG__\n\t"
      "push r24\n\t"
      "lds r24, %[n]\n\t"
      "subi r24, 0xff\n\t"  // +1; the carry chain below adds the carry
      "sts %[n], r24\n\t"
      "lds r24, %[n]+1\n\t"
      "sbci r24, 0xff\n\t"
      "sts %[n]+1, r24\n\t"
      "lds r24, %[n]+2\n\t"
      "sbci r24, 0xff\n\t"
      "sts %[n]+2, r24\n\t"
      "lds r24, %[n]+3\n\t"
      "sbci r24, 0xff\n\t"
      "sts %[n]+3, r24\n\t"
      "pop r24\n\t"
      "out __SREG__, r24\n\t"
      "pop r24\n\t"
      "reti\n\t" ::[n] "i"(&overflows));
}

// Only wakes the main loop: ldi and sts leave SREG alone, so nothing else needs saving.
ISR(TIMER1_COMPA_vect, ISR_NAKED) {
  __asm__ __volatile__(
      "push r24\n\t"
      "ldi r24, 1\n\t"
      "sts %[flag], r24\n\t"
      "pop r24\n\t"
      "reti\n\t" ::[flag] "i"(&capture_alarm_flag));
}
// The room sensor's wake-up does the same, so one vector serves both. Both rank below the capture and INT0
// vectors, so it can hold up an edge's vector only by its own length (11 cycles with RETI), less than the
// overflow vector's 34: a pending edge vector goes before any other lower one.
ISR(TIMER1_COMPB_vect, ISR_ALIASOF(TIMER1_COMPA_vect));
