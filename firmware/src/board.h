// Board facts in one place: clock and pin map of an ATmega328P Uno/Nano class board.
#ifndef BOARD_H
#define BOARD_H

// Clock. Uno R3 and most Nano clones clock the 328P at 16 MHz (resonator or crystal, see hardware-notes).
#define F_CPU 16000000UL
// Name in the hello line: avrdude's part id for the ATmega328P.
#define BOARD_MCU_NAME "m328p"
// Number of input channels reported in the hello line.
#define BOARD_CHANNELS 2

// ch0: Timer1 input capture ICP1 = PB0 = Arduino pin D8.
#define CH0_PIN PINB
#define CH0_PORT PORTB
#define CH0_DDR DDRB
#define CH0_BIT PB0

// ch1: external interrupt INT0 = PD2 = Arduino pin D2.
#define CH1_PIN PIND
#define CH1_PORT PORTD
#define CH1_DDR DDRD
#define CH1_BIT PD2

// 1 = enable the internal pull-ups on both inputs (open-collector photogate outputs need one).
#define BOARD_INPUT_PULLUPS 1

#endif
