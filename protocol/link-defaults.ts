// Host-side constants that must match the firmware build (firmware/src/config.h, board.h, capture.c).

/**
 * Serial rate of the shipped firmware (firmware/src/config.h `BAUD`). Exact at 16 MHz: UBRR0 = 3, U2X0 = 0,
 * 0.0 % error (ATmega328P datasheet, USART "Examples of Baud Rate Setting" table; docs/references.md#ref-atmega328p); 115200 would be +2.1 %.
 * The emulator test reads the divisor the firmware programs and checks it against this value.
 */
export const DEFAULT_BAUD = 250_000;

/** Nominal Timer1 rate of the shipped firmware (prescaler 1 at F_CPU); the H line's `hz` says the same. */
export const DEFAULT_TICK_HZ = 16_000_000;

/**
 * Ticks between an input edge on real silicon and the timestamp the firmware reports for it, per channel.
 * The host subtracts these from `E` ticks. Constant offsets cancel in periods; they matter only when the
 * two channels are compared (a second gate, a 1 PPS reference).
 *
 * ch0 (ICP1, hardware capture): 4 = the input capture noise canceler's delay, "4 system clock cycles"
 * (ATmega328P datasheet, Timer/Counter1 "Noise Canceler"). The pin synchronizer adds a further fixed
 * 2.5–3.5 cycles (datasheet, from memory, not included). The emulator shows 0 because simavr models neither.
 *
 * ch1 (INT0, counter read in software): 21, derived, not measured on silicon: interrupt response 4 cycles
 * + 4 more when waking from sleep ("Interrupt Response Time", datasheet) + 3 for the vector's JMP + 9 for the
 * flag and level samples that come first (two PUSH, two IN, SBI, OUT) + 1 into the LDS of TCNT1L. The
 * emulator measures 12 (simavr enters an interrupt faster than silicon). When another ISR is running the
 * read waits for it: see CH1_MAX_EXTRA_LATENCY_TICKS.
 */
export const CHANNEL_LATENCY_TICKS: readonly [number, number] = [4, 21];

/**
 * The same latencies measured in simavr 1.6 (test/firmware/firmware-timestamps.test.ts, firmware-ch1-sweep.test.ts
 * assert them): ch1 is 12 ticks for every edge that finds the CPU asleep, 66 % of 722 edges in a busy schedule.
 */
export const EMULATOR_CHANNEL_LATENCY_TICKS: readonly [number, number] = [0, 12];

/**
 * Worst extra ch1 latency, measured in the emulator: an INT0 edge that arrives just after a ch0 capture
 * waits for the capture ISR to finish (the longest ISR), and one during its own handler waits for that.
 * Typical extra latency is 0; this bound is the jitter to allow when comparing ch1 with ch0 edge by edge
 * (measured: at most 196 over 722 edges aimed at the busy moments, median 0, 90 % within 125; in the soak
 * at 75 % of the line's capacity 90 % at 0 and at most 77; 200 ticks = 12.5 µs at 16 MHz).
 */
export const CH1_MAX_EXTRA_LATENCY_TICKS = 200;

/**
 * Shortest ch0 pulse whose two edges both come back, measured in the emulator (28 cycles = 1.75 µs): the
 * capture ISR must flip the edge select before the second edge. Shorter pulses lose their second edge,
 * and the firmware counts it in the `T` record's `lost` field (the vector samples the pin one cycle after
 * the flip, so the check no longer depends on when the rest of the handler runs).
 */
export const CH0_MIN_PULSE_TICKS = 28;

/**
 * Edges the ch0 firmware cannot account for, by physics: the capture register holds one time, so when two
 * more edges follow a capture before the vector has read ICR1 and flipped the edge select, the pin is back
 * at the level the flip expects and nothing shows they happened. Measured in the emulator with the CPU idle:
 * a rise, fall, rise whose two gaps sum to 30 ticks or more always adds up (returned + lost = applied), and
 * so do gaps both of 10 or less (the vector sees the re-capture before its flip); 5 + 20 and 20 + 5 do not
 * (a second edge within ~10 ticks, before ICR1 is read, or a third in the 3 ticks between the vector's ICF1
 * test and its flip, 25–27 ticks after the capture).
 * The same hole opens for longer while a capture waits for the vector: a capture that arrives while the
 * handler of the previous edge runs (up to about 195 ticks after that edge: the ch1 figure above) waits
 * for it to finish, and two more edges within that wait vanish the same way (uniform trains of 6 edges
 * need gaps of 180 ticks or more to add up exactly); likewise 34 ticks while the overflow ISR runs.
 * test/firmware/firmware-edge-accounting.test.ts sweeps the trains outside these holes and requires the
 * exact sum. On silicon the noise canceler drops pulses under 4 cycles before they reach the capture.
 * ch1 (INT0) has the same hole: three changes before its vector's entry look like one (the entry clears
 * INTF0; 1 cycle idle in the emulator, up to 38 behind the overflow ISR, longer behind the others), and so
 * do two in the two cycles between its flag sample and the flag's clear. Everything else is seen and
 * counted: test/firmware/firmware-ch1-sweep.test.ts runs rise, fall, rise with every pair of gaps 2..60.
 */
export const CH0_UNCOUNTED_PAIR_TICKS = 30;


/** Edges the firmware can buffer while the UART is busy (ring of 64 entries, one kept free). */
export const EDGE_RING_CAPACITY = 63;

/** Longest command line the firmware accepts, before its LF and a CR included; longer gets `err <c> too-long`. */
export const COMMAND_MAX_BYTES = 16;

/** Default heartbeat period (`P` changes it within 100..60000 ms). */
export const HEARTBEAT_DEFAULT_MS = 1000;
export const HEARTBEAT_MIN_MS = 100;
export const HEARTBEAT_MAX_MS = 60_000;

/** Room readings: every 10 s after boot; `A` takes 0 (off) to 3600 s (firmware/src/room.h, command.h AIR_MAX_S). */
export const AIR_DEFAULT_S = 10;
export const AIR_MAX_S = 3600;
