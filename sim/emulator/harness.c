// simavr harness: runs the firmware ELF on a simulated ATmega328P, applies a schedule of input level
// changes at given cycles, feeds host command bytes, and records UART output and the cycle at which
// each change was really applied. Built with the system cc against libsimavr (Debian simavr 1.6).
// With --stream it is driven from stdin instead (changes, host bytes and "run to cycle N" requests, for
// runs of any length and for real-time use) and reports UART lines and applied changes on stdout.
#include <errno.h>
#include <inttypes.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <simavr/avr_ioport.h>
#include <simavr/avr_timer.h>
#include <simavr/avr_twi.h>
#include <simavr/avr_uart.h>
#include <simavr/sim_avr.h>
#include <simavr/sim_elf.h>
#include <simavr/sim_interrupts.h>
#include <simavr/sim_regbit.h>

#define HZ 16000000u
// Data-space addresses of the ATmega328P registers the harness touches (datasheet register summary).
#define ADDR_TIFR0 0x35
#define ADDR_MCUSR 0x54
#define ADDR_TCCR1B 0x81
#define ADDR_UCSR0A 0xc0
#define ADDR_UBRR0L 0xc4
#define ADDR_UBRR0H 0xc5

typedef struct {
  uint64_t cycle;
  int ch;
  int level;
} change_t;

typedef struct {
  uint64_t cycle;
  uint8_t *bytes;
  size_t n;
} command_t;

static avr_t *avr;
static avr_irq_t *pin_irq[2];
static change_t *changes;
static size_t n_changes, next_change;
static command_t *commands;
static size_t n_commands, next_command, next_command_byte;
static uint64_t host_byte_cycles;
static int rx_xoff;
static FILE *uart_out, *applied_out, *uart_times_out;
static uint64_t timer1_start = UINT64_MAX;
static avr_io_write_t tccr1b_original;
static void *tccr1b_param;
static unsigned long bytes_out;
static size_t changes_cap, commands_cap;
static int change_timer_armed, command_timer_armed;
// --stream: protocol output (stdout at start; simavr's own messages are sent to stderr instead).
static FILE *stream_out;
static uint8_t line_buf[256];
static size_t line_len;
static uint64_t line_first_cycle;

static void die(const char *what) {
  fprintf(stderr, "halfswing-emu: %s\n", what);
  exit(2);
}

// ---- silicon semantics for TIFRn: write one to clear, only the bits written as one ----------------
static void clear_if_written(avr_t *a, avr_int_vector_t *v, uint8_t written) {
  if (!v->raised.reg) return;
  if (!(written & (v->raised.mask << v->raised.bit))) return;
  avr_clear_interrupt(a, v);
  avr_regbit_clear(a, v->raised);
}

static void tifr_write_one_to_clear(avr_t *a, avr_io_addr_t addr, uint8_t v, void *param) {
  (void)addr;
  avr_timer_t *t = (avr_timer_t *)param;
  clear_if_written(a, &t->overflow, v);
  clear_if_written(a, &t->icr, v);
  for (int i = 0; i < AVR_TIMER_COMP_COUNT; i++) clear_if_written(a, &t->comp[i].interrupt, v);
}

// simavr 1.6 clears every pending flag of a timer on any TIFR write (fixed upstream in PR #415).
static void install_tifr_fix(void) {
  for (int n = 0; n < 3; n++) {
    avr_io_addr_t addr = (avr_io_addr_t)(ADDR_TIFR0 + n);
    int io = AVR_DATA_TO_IO(addr);
    avr_timer_t *t = (avr_timer_t *)avr->io[io].w.param;
    if (!avr->io[io].w.c || !t || t->overflow.raised.reg != addr || t->name != '0' + n)
      die("TIFR write handler is not simavr's timer handler; cannot install the write-one-to-clear fix");
    avr->io[io].w.c = tifr_write_one_to_clear;
  }
}

// The same for the external interrupt flags (EIFR: INTF0, INTF1), which simavr 1.6 does not clear on a
// write of one at all: the vector stays pending and runs again.
#define ADDR_EIFR 0x3c
static avr_int_vector_t *eifr_vectors[8];

static void eifr_write_one_to_clear(avr_t *a, avr_io_addr_t addr, uint8_t v, void *param) {
  (void)addr;
  (void)param;
  for (int i = 0; i < 8 && eifr_vectors[i]; i++) clear_if_written(a, eifr_vectors[i], v);
}

static void install_eifr_fix(void) {
  int n = 0;
  for (int i = 0; i < 64 && n < 8; i++) {
    avr_int_vector_t *v = avr->interrupts.vector[i];
    if (v && v->raised.reg == ADDR_EIFR) eifr_vectors[n++] = v;
  }
  if (n == 0) die("no vector flags in EIFR; cannot install the write-one-to-clear fix");
  int io = AVR_DATA_TO_IO(ADDR_EIFR);
  avr->io[io].w.c = eifr_write_one_to_clear;
  avr->io[io].w.param = NULL;
}

// Records the cycle at which Timer1's clock starts: the firmware's tick 0.
static void tccr1b_watch(avr_t *a, avr_io_addr_t addr, uint8_t v, void *param) {
  (void)param;
  uint8_t before = a->data[addr] & 7;
  tccr1b_original(a, addr, v, tccr1b_param);
  if (!before && (v & 7) && timer1_start == UINT64_MAX) {
    timer1_start = a->cycle;
    if (stream_out) fprintf(stream_out, "t %" PRIu64 "\n", timer1_start);
  }
}

static void install_tccr1b_watch(void) {
  int io = AVR_DATA_TO_IO(ADDR_TCCR1B);
  if (!avr->io[io].w.c) die("no TCCR1B write handler");
  tccr1b_original = avr->io[io].w.c;
  tccr1b_param = avr->io[io].w.param;
  avr->io[io].w.c = tccr1b_watch;
}

// ---- schedule of input changes ---------------------------------------------------------------------
// The input is driven from outside: registering the level as the port's "external" value makes simavr
// keep it when the firmware writes PORTx (pull-ups), instead of pulling the pin high.
static void set_external(int ch, int level) {
  avr_ioport_external_t e = {.name = ch ? 'D' : 'B', .mask = ch ? 1u << 2 : 1u, .value = 0};
  e.value = level ? e.mask : 0;
  avr_ioctl(avr, AVR_IOCTL_IOPORT_SET_EXTERNAL(e.name), &e);
}

static void drive(int ch, int level) {
  set_external(ch, level);
  avr_raise_irq(pin_irq[ch], (uint32_t)level);
}

static avr_cycle_count_t apply_changes(avr_t *a, avr_cycle_count_t when, void *param) {
  (void)when;
  (void)param;
  while (next_change < n_changes && changes[next_change].cycle <= a->cycle) {
    change_t *c = &changes[next_change++];
    drive(c->ch, c->level);
    fprintf(applied_out, "%s%" PRIu64 " %d %d\n", stream_out ? "a " : "", (uint64_t)a->cycle, c->ch, c->level);
  }
  if (next_change < n_changes) return changes[next_change].cycle;
  change_timer_armed = 0;
  return 0;
}

static void push_change(uint64_t cycle, int ch, int level) {
  if (ch < 0 || ch > 1 || (level != 0 && level != 1)) die("schedule: channel must be 0 or 1, level 0 or 1");
  if (n_changes && cycle < changes[n_changes - 1].cycle) die("schedule: cycles must not decrease");
  if (n_changes == changes_cap) {
    changes_cap = changes_cap ? 2 * changes_cap : 1024;
    changes = realloc(changes, changes_cap * sizeof *changes);
    if (!changes) die("out of memory");
  }
  changes[n_changes++] = (change_t){cycle, ch, level};
}

// Cycle timers take a delay from now; a change already due is applied after the next instruction.
static uint64_t delay_to(uint64_t cycle) { return cycle > avr->cycle ? cycle - avr->cycle : 1; }

static void arm_changes(void) {
  if (change_timer_armed || next_change >= n_changes) return;
  avr_cycle_timer_register(avr, delay_to(changes[next_change].cycle), apply_changes, NULL);
  change_timer_armed = 1;
}

// ---- host command bytes, paced at the host's byte time ---------------------------------------------
static avr_irq_t *uart_irq;

static avr_cycle_count_t feed_command_bytes(avr_t *a, avr_cycle_count_t when) {
  if (next_command >= n_commands) return 0;
  command_t *c = &commands[next_command];
  if (a->cycle < c->cycle) return c->cycle;
  if (rx_xoff) return when + host_byte_cycles;
  avr_raise_irq(uart_irq + UART_IRQ_INPUT, c->bytes[next_command_byte++]);
  if (next_command_byte == c->n) {
    next_command++;
    next_command_byte = 0;
    if (next_command >= n_commands) return 0;
    uint64_t at = when + host_byte_cycles;
    return commands[next_command].cycle > at ? commands[next_command].cycle : at;
  }
  return when + host_byte_cycles;
}

static avr_cycle_count_t feed_command(avr_t *a, avr_cycle_count_t when, void *param) {
  (void)param;
  avr_cycle_count_t next = feed_command_bytes(a, when);
  if (!next) command_timer_armed = 0;
  return next;
}

static void arm_commands(void) {
  if (command_timer_armed || next_command >= n_commands) return;
  avr_cycle_timer_register(avr, delay_to(commands[next_command].cycle), feed_command, NULL);
  command_timer_armed = 1;
}

// --stream: one line per finished UART line, "l <cycle of its first byte> <cycle of its LF> <hex bytes>".
static void stream_byte(uint8_t b) {
  if (line_len == 0) line_first_cycle = avr->cycle;
  if (line_len < sizeof line_buf) line_buf[line_len++] = b;
  if (b != '\n' && line_len < sizeof line_buf) return;
  fprintf(stream_out, "l %" PRIu64 " %" PRIu64 " ", line_first_cycle, (uint64_t)avr->cycle);
  for (size_t i = 0; i < line_len; i++) fprintf(stream_out, "%02x", line_buf[i]);
  fputc('\n', stream_out);
  line_len = 0;
}

static void uart_byte_out(avr_irq_t *irq, uint32_t value, void *param) {
  (void)irq;
  (void)param;
  bytes_out++;
  if (stream_out) return stream_byte((uint8_t)value);
  fputc((int)(value & 0xff), uart_out);
  if ((value & 0xff) == '\n' && uart_times_out) fprintf(uart_times_out, "%" PRIu64 "\n", (uint64_t)avr->cycle);
}

static void uart_xon(avr_irq_t *irq, uint32_t value, void *param) {
  (void)irq;
  (void)param;
  (void)value;
  rx_xoff = 0;
}

static void uart_xoff(avr_irq_t *irq, uint32_t value, void *param) {
  (void)irq;
  (void)param;
  (void)value;
  rx_xoff = 1;
}

// Simulated hang of the main loop: the CPU is parked on a `rjmp .` (avr-libc's __stop_program loop) with
// interrupts still on, as when main spins forever; ISRs keep running, the watchdog is no longer reset.
static void stall(avr_t *a) {
  for (uint32_t pc = 0; pc + 1 < a->flashend; pc += 2) {
    if (a->flash[pc] == 0xff && a->flash[pc + 1] == 0xcf) {
      a->pc = pc;
      if (a->state == cpu_Sleeping) a->state = cpu_Running;
      fprintf(applied_out, "%" PRIu64 " stall\n", (uint64_t)a->cycle);
      return;
    }
  }
  die("stall: no `rjmp .` in the firmware");
}

static void no_sleep(avr_t *a, avr_cycle_count_t how_long) {
  (void)a;
  (void)how_long;
}

// ---- a BME280 on the TWI bus ------------------------------------------------------------------------
// Register map, chip id and calibration layout of the Bosch BME280 datasheet (memory map; trimming
// parameters at 0x88..0xA1 and 0xE1..0xE7). The environment is a schedule of raw ADC readings ("cycle adcT
// adcP adcH"); a forced-mode write to ctrl_meas latches the reading in force at that cycle, sets the status
// register's measuring bit and fills the data registers when the measurement ends, 8 ms later (x1
// oversampling takes up to 9.3 ms). Served readings are logged ("cycle adcT adcP adcH") for the tests.
#define BME_REG_ID 0xd0
#define BME_REG_STATUS 0xf3
#define BME_REG_CTRL_MEAS 0xf4
#define BME_REG_DATA 0xf7
#define BME_MEASURE_CYCLES (HZ / 125)
#define ADDR_TWCR 0xbc
#define TWSTA_BIT 0x20

typedef struct {
  uint64_t cycle;
  uint32_t t, p, h;
} bme_sample_t;

static struct {
  int addr;  // 7-bit address, or -1: no sensor on the bus
  uint8_t reg[256];
  uint8_t pointer;
  int selected, index;
  uint64_t absent_at, return_at, hang_at, sda_low_at;
  bme_sample_t *samples;
  size_t n_samples;
  bme_sample_t measuring;
  FILE *log;
  avr_irq_t *twi_irq;
} bme = {.addr = -1, .absent_at = UINT64_MAX, .return_at = UINT64_MAX, .hang_at = UINT64_MAX, .sda_low_at = UINT64_MAX};
static avr_io_write_t twcr_original;
static void *twcr_param;

static int bme_answers(void) { return bme.addr >= 0 && !(avr->cycle >= bme.absent_at && avr->cycle < bme.return_at); }

static void twi_reply(uint8_t msg, uint8_t addr, uint8_t data) {
  avr_raise_irq(bme.twi_irq + TWI_IRQ_INPUT, avr_twi_irq_msg(msg, addr, data));
}

static avr_cycle_count_t bme_measure_done(avr_t *a, avr_cycle_count_t when, void *param) {
  (void)a;
  (void)when;
  (void)param;
  bme_sample_t m = bme.measuring;
  uint8_t *d = &bme.reg[BME_REG_DATA];
  d[0] = (uint8_t)(m.p >> 12), d[1] = (uint8_t)(m.p >> 4), d[2] = (uint8_t)(m.p << 4);
  d[3] = (uint8_t)(m.t >> 12), d[4] = (uint8_t)(m.t >> 4), d[5] = (uint8_t)(m.t << 4);
  d[6] = (uint8_t)(m.h >> 8), d[7] = (uint8_t)m.h;
  bme.reg[BME_REG_STATUS] &= (uint8_t)~0x08;
  bme.reg[BME_REG_CTRL_MEAS] &= (uint8_t)~0x03;  // back to sleep mode
  return 0;
}

static void bme_write(uint8_t reg, uint8_t v) {
  if (reg < 0xf2 && reg != 0xe0) return;  // calibration and id are read-only
  bme.reg[reg] = v;
  if (reg == BME_REG_CTRL_MEAS && (v & 3) && (v & 3) != 3) {
    size_t i = 0;
    while (i + 1 < bme.n_samples && bme.samples[i + 1].cycle <= avr->cycle) i++;
    bme.measuring = bme.n_samples ? bme.samples[i] : (bme_sample_t){0, 0x80000, 0x80000, 0x8000};
    bme.measuring.cycle = avr->cycle;
    if (bme.log)
      fprintf(bme.log, "%" PRIu64 " %u %u %u\n", (uint64_t)avr->cycle, bme.measuring.t, bme.measuring.p, bme.measuring.h);
    bme.reg[BME_REG_STATUS] |= 0x08;
    avr_cycle_timer_register(avr, BME_MEASURE_CYCLES, bme_measure_done, NULL);
  }
}

// The slave side of simavr's TWI messages (as its i2c_eeprom part does): ACK our address and each byte
// written, hand out register bytes on reads; the first byte of a write sets the register pointer.
static void bme_twi_hook(avr_irq_t *irq, uint32_t value, void *param) {
  (void)irq;
  (void)param;
  avr_twi_msg_irq_t v;
  v.u.v = value;
  if (v.u.twi.msg & TWI_COND_STOP) bme.selected = 0;
  if (v.u.twi.msg & TWI_COND_START) {
    bme.selected = 0;
    bme.index = 0;
    if (bme_answers() && (v.u.twi.addr >> 1) == bme.addr) {
      bme.selected = v.u.twi.addr;
      twi_reply(TWI_COND_ACK, bme.selected, 1);
    }
  }
  if (!bme.selected) return;
  if (v.u.twi.msg & TWI_COND_WRITE) {
    twi_reply(TWI_COND_ACK, bme.selected, 1);
    if (bme.index++ == 0)
      bme.pointer = v.u.twi.data;
    else
      bme_write(bme.pointer++, v.u.twi.data);
  }
  if (v.u.twi.msg & TWI_COND_READ) twi_reply(TWI_COND_READ, bme.selected, bme.reg[bme.pointer++]);
}

// A stuck bus: the TWI never completes a start (silicon waits for a free bus), so TWCR writes that would
// start one are kept out of simavr's TWI; with --sda-low-at the SDA pin (PC4) also reads low.
static void twcr_watch(avr_t *a, avr_io_addr_t addr, uint8_t v, void *param) {
  (void)param;
  if (a->cycle >= bme.hang_at || a->cycle >= bme.sda_low_at) {
    a->data[addr] = (uint8_t)(v & ~TWSTA_BIT & ~0x80);
    return;
  }
  twcr_original(a, addr, v, twcr_param);
}

static avr_cycle_count_t sda_low(avr_t *a, avr_cycle_count_t when, void *param) {
  (void)a;
  (void)when;
  (void)param;
  avr_ioport_external_t e = {.name = 'C', .mask = 1u << 4, .value = 0};
  avr_ioctl(avr, AVR_IOCTL_IOPORT_SET_EXTERNAL('C'), &e);
  avr_raise_irq(avr_io_getirq(avr, AVR_IOCTL_IOPORT_GETIRQ('C'), 4), 0);
  if (applied_out) fprintf(applied_out, "%" PRIu64 " sda-low\n", (uint64_t)avr->cycle);
  return 0;
}

static int hexval(int c);

// Calibration: 33 bytes as hex, the contents of 0x88..0xA1 then 0xE1..0xE7.
static void install_bme(const char *addr_s, const char *calib_hex, const char *env_path, const char *log_path) {
  bme.addr = (int)strtol(addr_s, NULL, 0);
  bme.reg[BME_REG_ID] = 0x60;
  if (!calib_hex || strlen(calib_hex) != 66) die("--bme-calib: 33 bytes as hex");
  for (int i = 0; i < 33; i++) {
    int hi = hexval(calib_hex[2 * i]), lo = hexval(calib_hex[2 * i + 1]);
    if (hi < 0 || lo < 0) die("--bme-calib: bad hex");
    bme.reg[i < 26 ? 0x88 + i : 0xe1 + i - 26] = (uint8_t)(hi * 16 + lo);
  }
  bme.reg[0xf7] = bme.reg[0xfa] = 0x80;  // reset values of the data registers (datasheet memory map)
  bme.reg[0xfd] = 0x80;
  if (env_path) {
    FILE *f = fopen(env_path, "r");
    if (!f) die("cannot open the --bme-env file");
    size_t cap = 64;
    bme.samples = malloc(cap * sizeof *bme.samples);
    bme_sample_t m;
    while (fscanf(f, "%" SCNu64 " %u %u %u", &m.cycle, &m.t, &m.p, &m.h) == 4) {
      if (m.t > 0xfffff || m.p > 0xfffff || m.h > 0xffff) die("--bme-env: raw values are 20, 20 and 16 bits");
      if (bme.n_samples == cap) bme.samples = realloc(bme.samples, (cap *= 2) * sizeof *bme.samples);
      bme.samples[bme.n_samples++] = m;
    }
    fclose(f);
  }
  if (log_path && !(bme.log = fopen(log_path, "w"))) die("cannot open the --bme-log file");
}

static void install_twi_device(void) {
  bme.twi_irq = avr_io_getirq(avr, AVR_IOCTL_TWI_GETIRQ(0), 0);
  if (!bme.twi_irq) die("simavr has no TWI on this part");
  avr_irq_register_notify(bme.twi_irq + TWI_IRQ_OUTPUT, bme_twi_hook, NULL);
  int io = AVR_DATA_TO_IO(ADDR_TWCR);
  if (!avr->io[io].w.c) die("no TWCR write handler");
  twcr_original = avr->io[io].w.c;
  twcr_param = avr->io[io].w.param;
  avr->io[io].w.c = twcr_watch;
  if (bme.sda_low_at != UINT64_MAX) avr_cycle_timer_register(avr, bme.sda_low_at, sda_low, NULL);
}

// ---- input files -----------------------------------------------------------------------------------
static void read_schedule(const char *path) {
  FILE *f = fopen(path, "r");
  if (!f) die("cannot open the schedule file");
  uint64_t cycle;
  int ch, level;
  while (fscanf(f, "%" SCNu64 " %d %d", &cycle, &ch, &level) == 3) push_change(cycle, ch, level);
  fclose(f);
}

static int hexval(int c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  return -1;
}

// "<cycle> <bytes as lowercase hex>": host bytes from that cycle on.
static void push_command(uint64_t cycle, const char *hex) {
  size_t len = strlen(hex);
  if (len % 2) die("commands: odd hex length");
  if (n_commands == commands_cap) {
    commands_cap = commands_cap ? 2 * commands_cap : 16;
    commands = realloc(commands, commands_cap * sizeof *commands);
    if (!commands) die("out of memory");
  }
  command_t *c = &commands[n_commands];
  c->cycle = cycle;
  c->n = len / 2;
  c->bytes = malloc(c->n ? c->n : 1);
  for (size_t i = 0; i < c->n; i++) {
    int hi = hexval(hex[2 * i]), lo = hexval(hex[2 * i + 1]);
    if (hi < 0 || lo < 0) die("commands: bad hex");
    c->bytes[i] = (uint8_t)(hi * 16 + lo);
  }
  n_commands++;
}

// One command per line.
static void read_commands(const char *path) {
  FILE *f = fopen(path, "r");
  if (!f) die("cannot open the commands file");
  char hex[4096];
  uint64_t cycle;
  while (fscanf(f, "%" SCNu64 " %4095s", &cycle, hex) == 2) push_command(cycle, hex);
  fclose(f);
}

static const char *arg_value(int argc, char **argv, const char *name) {
  for (int i = 1; i < argc - 1; i++)
    if (!strcmp(argv[i], name)) return argv[i + 1];
  return NULL;
}

static int has_flag(int argc, char **argv, const char *name) {
  for (int i = 1; i < argc; i++)
    if (!strcmp(argv[i], name)) return 1;
  return 0;
}

// Both inputs start low; changes at cycle 0 set other initial levels before the firmware runs. A low
// level is only registered, not raised: the pin IRQ already reads 0, and raising it while INT0 is in its
// reset (low-level) mode starts a per-cycle poll in simavr 1.6 that never ends and stops idle skipping.
static void start_inputs(void) {
  int initial[2] = {0, 0};
  while (next_change < n_changes && changes[next_change].cycle == 0) {
    change_t *c = &changes[next_change++];
    initial[c->ch] = c->level;
    fprintf(applied_out, "%s0 %d %d\n", stream_out ? "a " : "", c->ch, c->level);
  }
  for (int ch = 0; ch < 2; ch++) {
    if (initial[ch])
      drive(ch, 1);
    else
      set_external(ch, 0);
  }
  arm_changes();
  arm_commands();
}

static uint64_t stall_at = UINT64_MAX;

// A timer that does nothing, so that idle sleep stops at the requested cycle instead of skipping past it.
static avr_cycle_count_t stop_here(avr_t *a, avr_cycle_count_t when, void *param) {
  (void)a;
  (void)when;
  (void)param;
  return 0;
}

static int run_until(uint64_t target) {
  int state = cpu_Running;
  if (target > avr->cycle) avr_cycle_timer_register(avr, target - avr->cycle, stop_here, NULL);
  while (avr->cycle < target) {
    // Between instructions (the core overwrites a PC changed from inside a cycle timer).
    if (avr->cycle >= stall_at) {
      stall(avr);
      stall_at = UINT64_MAX;
    }
    state = avr_run(avr);
    if (state == cpu_Done || state == cpu_Crashed) break;
  }
  return state;
}

// --stream requests, one a line: "e <cycle> <ch> <level>" (an input change, cycles not decreasing),
// "c <cycle> <hex>" (host bytes from that cycle on), "r <cycle>" (run to that cycle, answered "d <cycle>"
// once every line up to it has been written), "q" (stop). Changes and host bytes must be sent before the
// "r" that passes their cycle.
static int stream(void) {
  char req[8192];
  int started = 0, state = cpu_Running;
  while (fgets(req, sizeof req, stdin)) {
    uint64_t cycle;
    int ch, level;
    char hex[4096];
    if (req[0] == 'e' && sscanf(req + 1, "%" SCNu64 " %d %d", &cycle, &ch, &level) == 3) {
      push_change(cycle, ch, level);
      if (started) arm_changes();
    } else if (req[0] == 'c' && sscanf(req + 1, "%" SCNu64 " %4095s", &cycle, hex) == 2) {
      push_command(cycle, hex);
      if (started) arm_commands();
    } else if (req[0] == 'r' && sscanf(req + 1, "%" SCNu64, &cycle) == 1) {
      if (!started) start_inputs();
      started = 1;
      state = run_until(cycle);
      fprintf(stream_out, "d %" PRIu64 "\n", (uint64_t)avr->cycle);
      fflush(stream_out);
      if (state == cpu_Done || state == cpu_Crashed) break;
    } else if (req[0] == 'q') {
      break;
    } else {
      die("stream: unknown request");
    }
  }
  return state;
}

int main(int argc, char **argv) {
  const char *elf = arg_value(argc, argv, "--elf");
  const char *cycles_s = arg_value(argc, argv, "--cycles");
  const char *uart_path = arg_value(argc, argv, "--uart-out");
  const char *applied_path = arg_value(argc, argv, "--applied-out");
  const char *info_path = arg_value(argc, argv, "--info-out");
  int streaming = has_flag(argc, argv, "--stream");
  if (!elf || !info_path || (!streaming && (!cycles_s || !uart_path || !applied_path))) {
    fprintf(stderr,
            "usage: halfswing-emu --elf FILE --cycles N --uart-out FILE --applied-out FILE --info-out FILE\n"
            "       [--schedule FILE] [--commands FILE] [--uart-times FILE] [--host-baud N] [--no-tifr-fix]\n"
            "       [--stall-at CYCLE] [--bme-addr A --bme-calib HEX [--bme-env FILE] [--bme-log FILE]]\n"
            "       [--bme-absent-at CYCLE] [--bme-return-at CYCLE] [--twi-hang-at CYCLE] [--sda-low-at CYCLE]\n"
            "   or: halfswing-emu --stream --elf FILE --info-out FILE [--host-baud N]  (requests on stdin)\n");
    return 2;
  }
  const char *baud_s = arg_value(argc, argv, "--host-baud");
  unsigned long host_baud = baud_s ? strtoul(baud_s, NULL, 10) : 250000;
  host_byte_cycles = (uint64_t)HZ * 10 / host_baud;
  int tifr_fix = !has_flag(argc, argv, "--no-tifr-fix");
  if (streaming) {
    // The protocol keeps the real stdout; anything simavr prints goes to stderr.
    int fd = dup(1);
    if (fd < 0 || dup2(2, 1) < 0 || !(stream_out = fdopen(fd, "w"))) die("cannot set up the stream output");
    setvbuf(stream_out, NULL, _IOFBF, 1 << 16);
    applied_out = stream_out;
  }

  elf_firmware_t fw;
  memset(&fw, 0, sizeof fw);
  if (elf_read_firmware(elf, &fw)) die("cannot read the firmware ELF");
  strcpy(fw.mmcu, "atmega328p");
  fw.frequency = HZ;
  avr = avr_make_mcu_by_name(fw.mmcu);
  if (!avr) die("simavr has no atmega328p");
  avr->log = LOG_ERROR;
  avr_init(avr);
  avr_load_firmware(avr, &fw);
  avr->frequency = HZ;
  avr->sleep = no_sleep;  // idle sleep jumps to the next event instead of waiting in real time
  avr->data[ADDR_MCUSR] |= 1;  // PORF: this run is a power-on, as on a board plugged in (simavr leaves 0)

  if (tifr_fix) {
    install_tifr_fix();
    install_eifr_fix();
  }
  install_tccr1b_watch();
  const char *bme_addr = arg_value(argc, argv, "--bme-addr");
  if (bme_addr)
    install_bme(bme_addr, arg_value(argc, argv, "--bme-calib"), arg_value(argc, argv, "--bme-env"),
                arg_value(argc, argv, "--bme-log"));
  const char *at;
  if ((at = arg_value(argc, argv, "--bme-absent-at"))) bme.absent_at = strtoull(at, NULL, 10);
  if ((at = arg_value(argc, argv, "--bme-return-at"))) bme.return_at = strtoull(at, NULL, 10);
  if ((at = arg_value(argc, argv, "--twi-hang-at"))) bme.hang_at = strtoull(at, NULL, 10);
  if ((at = arg_value(argc, argv, "--sda-low-at"))) bme.sda_low_at = strtoull(at, NULL, 10);

  if (!streaming) {
    uart_out = fopen(uart_path, "wb");
    applied_out = fopen(applied_path, "w");
    if (!uart_out || !applied_out) die("cannot open the output files");
    const char *times_path = arg_value(argc, argv, "--uart-times");
    if (times_path && !(uart_times_out = fopen(times_path, "w"))) die("cannot open the uart-times file");
  }

  // UART: bytes to our own file, not simavr's console echo.
  uint32_t flags = 0;
  avr_ioctl(avr, AVR_IOCTL_UART_GET_FLAGS('0'), &flags);
  flags &= ~(uint32_t)AVR_UART_FLAG_STDIO;
  avr_ioctl(avr, AVR_IOCTL_UART_SET_FLAGS('0'), &flags);
  uart_irq = avr_io_getirq(avr, AVR_IOCTL_UART_GETIRQ('0'), 0);
  avr_irq_register_notify(uart_irq + UART_IRQ_OUTPUT, uart_byte_out, NULL);
  avr_irq_register_notify(uart_irq + UART_IRQ_OUT_XON, uart_xon, NULL);
  avr_irq_register_notify(uart_irq + UART_IRQ_OUT_XOFF, uart_xoff, NULL);

  install_twi_device();
  pin_irq[0] = avr_io_getirq(avr, AVR_IOCTL_IOPORT_GETIRQ('B'), IOPORT_IRQ_PIN0);
  pin_irq[1] = avr_io_getirq(avr, AVR_IOCTL_IOPORT_GETIRQ('D'), IOPORT_IRQ_PIN0 + 2);

  int state;
  if (streaming) {
    state = stream();
  } else {
    const char *schedule_path = arg_value(argc, argv, "--schedule");
    if (schedule_path) read_schedule(schedule_path);
    const char *commands_path = arg_value(argc, argv, "--commands");
    if (commands_path) read_commands(commands_path);
    const char *stall_s = arg_value(argc, argv, "--stall-at");
    if (stall_s) stall_at = strtoull(stall_s, NULL, 10);
    start_inputs();
    state = run_until(strtoull(cycles_s, NULL, 10));
  }

  FILE *info = fopen(info_path, "w");
  if (!info) die("cannot open the info file");
  unsigned ubrr = avr->data[ADDR_UBRR0L] | (unsigned)(avr->data[ADDR_UBRR0H] << 8);
  fprintf(info,
          "{\"hz\":%u,\"cycles\":%" PRIu64 ",\"timer1Start\":%" PRId64 ",\"tifrFix\":%s,\"state\":%d,"
          "\"ubrr\":%u,\"u2x\":%d,\"bytesOut\":%lu,\"changesApplied\":%zu}\n",
          HZ, (uint64_t)avr->cycle, timer1_start == UINT64_MAX ? (int64_t)-1 : (int64_t)timer1_start,
          tifr_fix ? "true" : "false", state, ubrr, (avr->data[ADDR_UCSR0A] >> 1) & 1, bytes_out, next_change);
  // Final values of the registers that say which interrupt sources and peripherals the firmware left on,
  // and OCR1A and OCR1B (the phases of the main loop's compare wake-ups: heartbeat, room sensor).
  static const struct {
    const char *name;
    unsigned addr;
  } regs[] = {{"EIMSK", 0x3d},  {"EECR", 0x3f},   {"SPCR", 0x4c},   {"ACSR", 0x50},  {"SMCR", 0x53},
              {"SPMCSR", 0x57}, {"WDTCSR", 0x60}, {"PCICR", 0x68},  {"PRR", 0x64},   {"TIMSK0", 0x6e},
              {"TIMSK1", 0x6f}, {"TIMSK2", 0x70}, {"ADCSRA", 0x7a}, {"TCCR1B", 0x81}, {"OCR1AL", 0x88},
              {"OCR1AH", 0x89}, {"OCR1BL", 0x8a}, {"OCR1BH", 0x8b}, {"TWCR", 0xbc},   {"UCSR0B", 0xc1}};
  fseek(info, -2, SEEK_CUR);  // reopen the JSON object: drop "}\n"
  fprintf(info, ",\"registers\":{");
  for (size_t i = 0; i < sizeof regs / sizeof regs[0]; i++)
    fprintf(info, "%s\"%s\":%u", i ? "," : "", regs[i].name, avr->data[regs[i].addr]);
  fprintf(info, "}}\n");
  fclose(info);
  if (uart_out) fclose(uart_out);
  fclose(applied_out);
  if (uart_times_out) fclose(uart_times_out);
  if (bme.log) fclose(bme.log);
  return state == cpu_Crashed ? 3 : 0;
}
