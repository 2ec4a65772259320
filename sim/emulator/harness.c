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
            "       [--stall-at CYCLE]\n"
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
  // Final values of the registers that say which interrupt sources and peripherals the firmware left on.
  static const struct {
    const char *name;
    unsigned addr;
  } regs[] = {{"EIMSK", 0x3d},  {"EECR", 0x3f},   {"SPCR", 0x4c},   {"ACSR", 0x50},  {"SMCR", 0x53},
              {"SPMCSR", 0x57}, {"WDTCSR", 0x60}, {"PCICR", 0x68},  {"PRR", 0x64},   {"TIMSK0", 0x6e},
              {"TIMSK1", 0x6f}, {"TIMSK2", 0x70}, {"ADCSRA", 0x7a}, {"TCCR1B", 0x81}, {"TWCR", 0xbc},
              {"UCSR0B", 0xc1}};
  fseek(info, -2, SEEK_CUR);  // reopen the JSON object: drop "}\n"
  fprintf(info, ",\"registers\":{");
  for (size_t i = 0; i < sizeof regs / sizeof regs[0]; i++)
    fprintf(info, "%s\"%s\":%u", i ? "," : "", regs[i].name, avr->data[regs[i].addr]);
  fprintf(info, "}}\n");
  fclose(info);
  if (uart_out) fclose(uart_out);
  fclose(applied_out);
  if (uart_times_out) fclose(uart_times_out);
  return state == cpu_Crashed ? 3 : 0;
}
