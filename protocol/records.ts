// Typed records of protocol v1 (protocol/SPEC.md): what a decoded device line is.

/** Hello: sent at boot and in reply to `?`. */
export interface HelloRecord {
  readonly kind: 'H';
  readonly seq: number;
  readonly proto: number;
  readonly fw: string;
  readonly mcu: string;
  /** Nominal timer ticks per second. */
  readonly hz: number;
  /** Number of input channels. */
  readonly ch: number;
  /** Random 16-bit id drawn at boot (0..0xffff). */
  readonly boot: number;
  /** Optional key=value fields beyond the fixed ones (e.g. `rc`, the reset cause), in wire order. */
  readonly extra: Readonly<Record<string, string>>;
}

/** One input edge: `r` the input went high, `f` it went low. */
export interface EdgeRecord {
  readonly kind: 'E';
  readonly seq: number;
  readonly ch: number;
  readonly edge: 'r' | 'f';
  /** Device ticks since boot (48-bit; exact in a JS number, which holds integers up to 2^53). */
  readonly ticks: number;
}

/** Timebase heartbeat. */
export interface HeartbeatRecord {
  readonly kind: 'T';
  readonly seq: number;
  readonly ticks: number;
  /** Edges the device dropped since boot. */
  readonly lost: number;
  /** Bitmask of present input levels, bit n = channel n. */
  readonly levels: number;
}

/** Reply to a host command. */
export interface ReplyRecord {
  readonly kind: 'R';
  readonly seq: number;
  readonly ok: boolean;
  /** The command the reply is for (`?`, `P`, `C`, or `-` when the command could not be read). */
  readonly cmd: string;
  /** For `err`: the reason token. */
  readonly reason?: string;
  /** For `ok`: further fields, raw tokens in wire order. */
  readonly fields: readonly string[];
}

/**
 * Room conditions read by the board's sensor (`A`), integers exactly as sent: `temp` hundredths of a degree
 * Celsius, `press` pascals, `hum` thousandths of a percent relative humidity.
 */
export interface AirRecord {
  readonly kind: 'A';
  readonly seq: number;
  /** Device ticks when the reading was taken. */
  readonly ticks: number;
  readonly temp: number;
  readonly press: number;
  readonly hum: number;
}

/** The room sensor's state (`S`): 0 = reading; otherwise the fault bits of `SENSOR_FAULTS`. */
export interface SensorRecord {
  readonly kind: 'S';
  readonly seq: number;
  readonly state: number;
}

/** Bits of the `S` record's state (protocol/SPEC.md, section 4.6). */
export const SENSOR_FAULTS = {
  /** No device acknowledged its address: no sensor fitted, or it stopped answering. */
  absent: 0x1,
  /** SDA or SCL held low, or the bus never finished a transfer (timed out). */
  bus: 0x2,
  /** A device answered but is not a BME280 (chip id not 0x60): it cannot give all three quantities. */
  chip: 0x4,
  /** Readings are switched off (`A 0`). */
  off: 0x8,
} as const;

/** A well-formed line of a kind this host does not know: counted and skipped. */
export interface UnknownRecord {
  readonly kind: 'unknown';
  readonly letter: string;
  readonly seq: number;
  readonly fields: readonly string[];
}

export type DeviceRecord = HelloRecord | EdgeRecord | HeartbeatRecord | ReplyRecord | AirRecord | SensorRecord | UnknownRecord;

/** Why a line was rejected. */
export type RejectReason =
  | 'empty'
  | 'too-long'
  | 'non-ascii'
  | 'truncated'
  | 'bad-crc'
  | 'bad-syntax'
  | 'bad-field'
  | 'missing-field'
  | 'extra-field';

export type DecodeResult =
  | { readonly ok: true; readonly record: DeviceRecord }
  | { readonly ok: false; readonly reason: RejectReason; readonly detail: string };

/** Limits fixed by protocol v1. */
export const PROTOCOL_VERSION = 1;
/** Maximum line length in bytes, the LF included. */
export const MAX_LINE_BYTES = 80;
/** Sequence numbers are 16-bit and wrap ffff → 0. */
export const SEQ_MODULO = 0x10000;
/** Largest `hum` of an `A` record: 100 %RH in thousandths. */
export const MAX_HUMIDITY = 100_000;
/** Ticks are at most 48 bits (12 hex digits). */
export const MAX_TICKS = 2 ** 48 - 1;
