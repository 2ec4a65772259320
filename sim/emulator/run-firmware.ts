// Runs the real firmware ELF in simavr through the C harness: edge times in, device lines out.
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { buildEmulatorParts, FIRMWARE_ELF, HARNESS_BIN } from './toolchain.ts';

const run = promisify(execFile);

/** The emulated part's clock: simavr runs the ATmega328P at 16 MHz, one cycle = one Timer1 tick. */
export const EMULATOR_HZ = 16_000_000;

/**
 * Emulated time after reset before the firmware captures edges: the boot id takes two 16 ms watchdog
 * periods, then the hello goes out and the channels are armed (measured: armed at ~34 ms).
 */
export const FIRMWARE_BOOT_S = 0.05;

/** One input level change. `t_s` is emulated time since reset (cycle = round(t_s × 16e6)). */
export interface FirmwareEdge {
  readonly t_s: number;
  /** 0 = ICP1 (PB0, pin D8), 1 = INT0 (PD2, pin D2). */
  readonly ch: 0 | 1;
  readonly level: 0 | 1;
}

/** Bytes the host sends, starting at emulated time `t_s`, paced at the host baud rate. Sent as is. */
export interface FirmwareCommand {
  readonly t_s: number;
  readonly text: string;
}

export interface RunFirmwareOptions {
  /** Level changes, any order (sorted here). Both inputs start low unless a change at t_s = 0 says otherwise. */
  readonly edges: readonly FirmwareEdge[];
  /** Emulated run time in seconds. */
  readonly durationS: number;
  readonly commands?: readonly FirmwareCommand[];
  /** Another ELF than firmware/build/halfswing.elf (e.g. a probe program). */
  readonly elfPath?: string;
  /** false runs with simavr 1.6's own TIFR/EIFR handling (not write-one-to-clear): only for harness tests. */
  readonly tifrFix?: boolean;
  /** Host side baud rate for pacing command bytes (default 250000). */
  readonly hostBaud?: number;
  /** Simulates a hang of the main loop at this emulated time (ISRs keep running): for watchdog tests. */
  readonly stallAtS?: number;
  /** A BME280 on the TWI bus (absent: nothing answers on the bus). */
  readonly room?: EmulatedRoomSensor;
  /** From this time on no TWI start completes (a device holds the bus mid-transfer): only timeouts see it. */
  readonly twiHangAtS?: number;
  /** From this time on SDA (PC4, pin A4) reads low and no start completes: a bus held low. */
  readonly sdaLowAtS?: number;
}

/** Raw ADC readings the emulated sensor gives from `t_s` on (20, 20 and 16 bits, as in its data registers). */
export interface RawRoomSample {
  readonly t_s: number;
  readonly adcT: number;
  readonly adcP: number;
  readonly adcH: number;
}

export interface EmulatedRoomSensor {
  /** 7-bit I²C address: 0x76 or 0x77. */
  readonly addr: number;
  /** Contents of 0x88..0xA1 then 0xE1..0xE7 (33 bytes). */
  readonly calib: Uint8Array;
  /** The environment as raw readings, in time order; the one in force when a measurement starts is served. */
  readonly samples: readonly RawRoomSample[];
  /** The sensor stops answering at this time ... */
  readonly absentAtS?: number;
  /** ... and answers again from this time. */
  readonly returnAtS?: number;
}

/** A measurement the emulated sensor made: when it was triggered, and the raw values it served. */
export interface ServedRoomSample {
  readonly cycle: number;
  readonly adcT: number;
  readonly adcP: number;
  readonly adcH: number;
}

/** A change as the harness really applied it (simavr applies a change at an instruction boundary). */
export interface AppliedChange {
  readonly cycle: number;
  readonly ch: 0 | 1;
  readonly level: 0 | 1;
}

export interface FirmwareRun {
  /** Device lines as received, without their LF (latin1); decode them with protocol/decode.ts. */
  readonly lines: string[];
  /** Cycle at which each line's LF left the UART, index-aligned with `lines`. */
  readonly lineCycles: number[];
  /** Every change the harness applied, in order (changes scheduled at cycle 0 included). */
  readonly applied: AppliedChange[];
  /** Cycles per second of the emulated part (16e6). */
  readonly hz: number;
  /** Cycle at which the firmware started Timer1: device tick 0. Ticks ≈ cycle − timer1StartCycle (ch0). */
  readonly timer1StartCycle: number;
  /** Cycles actually run. */
  readonly cycles: number;
  /** UART divisor and double-speed bit the firmware programmed (baud = hz / ((u2x ? 8 : 16)(ubrr + 1))). */
  readonly ubrr: number;
  readonly u2x: 0 | 1;
  /** Final values of interrupt-enable and peripheral registers (EIMSK, TIMSK0..2, PRR, WDTCSR, ...). */
  readonly registers: Readonly<Record<string, number>>;
  /** Measurements the emulated room sensor made (empty without one). */
  readonly roomServed: ServedRoomSample[];
}

interface HarnessInfo {
  hz: number;
  cycles: number;
  timer1Start: number;
  ubrr: number;
  u2x: 0 | 1;
  registers: Record<string, number>;
}

function toCycle(t_s: number): number {
  return Math.round(t_s * EMULATOR_HZ);
}

/** Runs the firmware for `durationS` of emulated time. Builds firmware and harness first if needed. */
export async function runFirmware(options: RunFirmwareOptions): Promise<FirmwareRun> {
  buildEmulatorParts();
  const dir = await mkdtemp(join(tmpdir(), 'halfswing-emu-'));
  try {
    const changes = options.edges
      .map((e) => ({ cycle: toCycle(e.t_s), ch: e.ch, level: e.level }))
      .sort((a, b) => a.cycle - b.cycle);
    const files = {
      schedule: join(dir, 'schedule.txt'),
      commands: join(dir, 'commands.txt'),
      uart: join(dir, 'uart.bin'),
      times: join(dir, 'uart-times.txt'),
      applied: join(dir, 'applied.txt'),
      info: join(dir, 'info.json'),
      bmeEnv: join(dir, 'bme-env.txt'),
      bmeLog: join(dir, 'bme-log.txt'),
    };
    await writeFile(files.schedule, changes.map((c) => `${c.cycle} ${c.ch} ${c.level}\n`).join(''));
    const commands = [...(options.commands ?? [])].sort((a, b) => a.t_s - b.t_s);
    await writeFile(
      files.commands,
      commands.map((c) => `${toCycle(c.t_s)} ${Buffer.from(c.text, 'latin1').toString('hex')}\n`).join(''),
    );
    const args = [
      '--elf', options.elfPath ?? FIRMWARE_ELF,
      '--cycles', String(toCycle(options.durationS)),
      '--schedule', files.schedule,
      '--commands', files.commands,
      '--uart-out', files.uart,
      '--uart-times', files.times,
      '--applied-out', files.applied,
      '--info-out', files.info,
      '--host-baud', String(options.hostBaud ?? 250_000),
    ];
    if (options.tifrFix === false) args.push('--no-tifr-fix');
    if (options.stallAtS !== undefined) args.push('--stall-at', String(toCycle(options.stallAtS)));
    args.push(...(await roomArgs(options, files)));
    // simavr prints its own messages on stdout; the UART bytes are in their own file.
    await run(HARNESS_BIN, args, { maxBuffer: 16 * 1024 * 1024 });
    const info = JSON.parse(await readFile(files.info, 'utf8')) as HarnessInfo;
    const text = (await readFile(files.uart)).toString('latin1');
    const lines = text.split('\n');
    lines.pop(); // the part after the last LF is an unfinished line (or empty)
    const lineCycles = (await readFile(files.times, 'utf8')).split('\n').filter((s) => s !== '').map(Number);
    const applied = (await readFile(files.applied, 'utf8'))
      .split('\n')
      .filter((s) => s !== '' && !s.endsWith(' stall') && !s.endsWith(' sda-low'))
      .map((s) => {
        const [cycle, ch, level] = s.split(' ').map(Number);
        return { cycle: cycle!, ch: ch as 0 | 1, level: level as 0 | 1 };
      });
    return {
      lines,
      lineCycles,
      applied,
      hz: info.hz,
      timer1StartCycle: info.timer1Start,
      cycles: info.cycles,
      ubrr: info.ubrr,
      u2x: info.u2x,
      registers: info.registers,
      roomServed: options.room ? await readServed(files.bmeLog) : [],
    };
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

async function roomArgs(options: RunFirmwareOptions, files: { bmeEnv: string; bmeLog: string }): Promise<string[]> {
  const args: string[] = [];
  const at = (flag: string, t_s: number | undefined): void => {
    if (t_s !== undefined) args.push(flag, String(toCycle(t_s)));
  };
  const room = options.room;
  if (room) {
    if (room.calib.length !== 33) throw new TypeError('room.calib: 33 bytes (0x88..0xA1, 0xE1..0xE7)');
    await writeFile(files.bmeEnv, room.samples.map((m) => `${toCycle(m.t_s)} ${m.adcT} ${m.adcP} ${m.adcH}\n`).join(''));
    args.push('--bme-addr', String(room.addr), '--bme-calib', Buffer.from(room.calib).toString('hex'), '--bme-env', files.bmeEnv, '--bme-log', files.bmeLog);
    at('--bme-absent-at', room.absentAtS);
    at('--bme-return-at', room.returnAtS);
  }
  at('--twi-hang-at', options.twiHangAtS);
  at('--sda-low-at', options.sdaLowAtS);
  return args;
}

async function readServed(path: string): Promise<ServedRoomSample[]> {
  return (await readFile(path, 'utf8'))
    .split('\n')
    .filter((s) => s !== '')
    .map((s) => {
      const [cycle, adcT, adcP, adcH] = s.split(' ').map(Number);
      return { cycle: cycle!, adcT: adcT!, adcP: adcP!, adcH: adcH! };
    });
}
