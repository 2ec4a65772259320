// Main loop: replies to commands, sends heartbeats and edge lines, sleeps when idle. Never waits on the UART.
#include <avr/interrupt.h>
#include <avr/io.h>
#include <avr/sleep.h>

#include "board.h"
#include "capture.h"
#include "command.h"
#include "config.h"
#include "flash-strings.h"
#include "report.h"
#include "room.h"
#include "system.h"
#include "uart.h"

#define TICKS_PER_MS (F_CPU / 1000UL)
#define ALL_CHANNELS ((1u << BOARD_CHANNELS) - 1)

static const char KEY_MS[] PROGMEM = "ms";
static const char KEY_MASK[] PROGMEM = "mask";
static const char KEY_S[] PROGMEM = "s";

static uint16_t seq;
static uint16_t boot_id;
static uint8_t channel_mask = ALL_CHANNELS;
static uint32_t period_ticks = HEARTBEAT_DEFAULT_MS * TICKS_PER_MS;
// Next heartbeat as a 64-bit tick count (the 48-bit counter never reaches the top).
static uint64_t next_heartbeat;
static command_line_t command_line;
static command_t pending_command;
static uint8_t command_waiting;
// The room sensor's wake-up as armed on Timer1 compare-B: the phase, and whether it is on.
static uint16_t wake_lo;
static uint8_t wake_on;

static uint64_t as_u64(ticks48_t t) { return ((uint64_t)t.hi << 16) | t.lo; }

static void send(const char *line, uint8_t n) {
  uart_write(line, n);
  seq++;
}

static void schedule_heartbeat(uint64_t at) {
  next_heartbeat = at;
  capture_set_alarm((uint16_t)at);
}

static void send_hello(void) {
  char line[REPORT_MAX_LINE];
  send(line, report_hello(line, seq, boot_id, (int8_t)system_reset_cause()));
  room_announce();
}

static void execute(const command_t *c) {
  char line[REPORT_MAX_LINE];
  switch (c->kind) {
    case CMD_HELLO:
      send_hello();
      return;
    case CMD_PERIOD:
      period_ticks = c->value * TICKS_PER_MS;
      schedule_heartbeat(as_u64(capture_now()) + period_ticks);
      send(line, report_ok(line, seq, 'P', KEY_MS, c->value, 0));
      return;
    case CMD_CHANNELS:
      channel_mask = (uint8_t)c->value;
      capture_set_mask(channel_mask);
      send(line, report_ok(line, seq, 'C', KEY_MASK, c->value, 1));
      return;
    case CMD_AIR:
      room_set_interval(c->value, as_u64(capture_now()));
      send(line, report_ok(line, seq, 'A', KEY_S, c->value, 0));
      return;
    case CMD_ERROR:
      send(line, report_err(line, seq, c->letter, c->reason));
      return;
  }
}

// One command at a time, and only when its longest reply fits, so a reply is never dropped.
static uint8_t service_commands(void) {
  uint8_t progressed = 0;
  uint8_t b;
  while (!command_waiting && uart_read(&b)) {
    progressed = 1;
    command_waiting = command_feed(&command_line, b, ALL_CHANNELS, &pending_command);
  }
  if (command_waiting && uart_tx_free() >= REPORT_MAX_LINE) {
    execute(&pending_command);
    command_waiting = 0;
    progressed = 1;
  }
  return progressed;
}

static uint8_t service_heartbeat(ticks48_t now) {
  if (uart_tx_free() < REPORT_MAX_HEARTBEAT) return 0;
  uint64_t t = as_u64(now);
  if (t < next_heartbeat) return 0;
  char line[REPORT_MAX_HEARTBEAT];
  send(line, report_heartbeat(line, seq, now, capture_lost(), capture_levels()));
  // Deadlines advance by whole periods, so heartbeats keep the device's own cadence and do not drift.
  uint64_t next = next_heartbeat + period_ticks;
  schedule_heartbeat(next > t ? next : t + period_ticks);
  return 1;
}

static uint8_t service_edges(void) {
  uint8_t progressed = 0;
  edge_t e;
  while (uart_tx_free() >= REPORT_MAX_EDGE && capture_pop(&e)) {
    char line[REPORT_MAX_EDGE];
    ticks48_t t = {e.hi, e.lo};
    send(line, report_edge(line, seq, e.flags & EDGE_CH_MASK, e.flags & EDGE_RISING, t));
    progressed = 1;
  }
  return progressed;
}

// The room sensor: one step per pass; its S and A lines only when the transmit ring has room for them.
static uint8_t service_room(uint64_t now) {
  uint8_t progressed = room_service(now);
  int16_t st = room_state_due();
  if (st >= 0 && uart_tx_free() >= REPORT_MAX_STATE) {
    char line[REPORT_MAX_STATE];
    send(line, report_state(line, seq, (uint8_t)st));
    room_state_sent();
    progressed = 1;
  }
  const room_reading_t *r = room_reading();
  if (r && uart_tx_free() >= REPORT_MAX_AIR) {
    char line[REPORT_MAX_AIR];
    send(line, report_air(line, seq, r->at, r->temp, r->press, r->hum));
    room_reading_sent();
    progressed = 1;
  }
  return progressed;
}

// Without a timer wake-up a reading would start at the first interrupt after its due time: up to one Timer1
// overflow (4.1 ms) late. Compare-B is armed in the overflow period before the due time, at its phase, so the
// loop looks again at the due time itself. A change counts as work: the loop sleeps only after a pass that did
// none, which reads the counter after this write, so a due time that passed before the write is seen there and
// one still ahead gets its match.
static uint8_t arm_room_wake(ticks48_t now) {
  uint16_t lo = wake_lo;
  uint8_t on = room_wake_phase(now.hi, &lo);
  if (lo == wake_lo && on == wake_on) return 0;
  wake_lo = lo;
  wake_on = on;
  capture_set_wake(lo, on);
  return 1;
}

// Sleep in idle mode until the next interrupt, unless an ISR left work since the last look. The check and
// the sleep instruction run with interrupts off; `sei` lets one more instruction (sleep) run first.
static void idle(void) {
  if (room_busy()) return;  // main's own state: no interrupt changes it
  cli();
  uint8_t work = capture_alarm_flag || uart_rx_pending() || (capture_pending() && uart_tx_free() >= REPORT_MAX_EDGE);
  capture_alarm_flag = 0;
  if (!work) {
    sleep_enable();
    sei();
    sleep_cpu();
    sleep_disable();
  }
  sei();
}

int main(void) {
  system_power_down_unused();
  capture_init();
  sei();
  boot_id = system_boot_id();
  uart_init();
  system_watchdog_start();
  send_hello();
  capture_set_mask(channel_mask);
  schedule_heartbeat(as_u64(capture_now()) + period_ticks);
  set_sleep_mode(SLEEP_MODE_IDLE);
  for (;;) {
    system_watchdog_pet();
    uint8_t progressed = service_commands();
    // One reading of the counter per pass: each is a short section with interrupts off.
    ticks48_t now = capture_now();
    progressed |= service_heartbeat(now);
    progressed |= service_edges();
    progressed |= service_room(as_u64(now));
    progressed |= arm_room_wake(now);
    if (!progressed) idle();
  }
}
