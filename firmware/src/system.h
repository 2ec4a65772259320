// Reset cause, watchdog, power reduction and the random boot id.
#ifndef SYSTEM_H
#define SYSTEM_H

#include <stdint.h>

// MCUSR reset-cause bits saved before anything else ran: PORF=1 EXTRF=2 BORF=4 WDRF=8.
uint8_t system_reset_cause(void);
// Powers down every peripheral the firmware does not use and sets the unused pins to pulled-up inputs.
void system_power_down_unused(void);
// 16-bit id that differs from boot to boot. Needs Timer1 running and interrupts enabled; takes about 32 ms.
uint16_t system_boot_id(void);
// Watchdog in reset mode: a main loop that stops petting it for 1 s resets the board.
void system_watchdog_start(void);
void system_watchdog_pet(void);

#endif
