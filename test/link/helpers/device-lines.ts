// Protocol lines for tests, made with the real encoder: a tiny stand-in for the device's line writer.
import { encodeRecord } from '../../../protocol/encode.ts';

/** Emits H, T and E lines with one shared sequence counter, as the firmware does. */
export class DeviceLines {
  seq = 0;
  constructor(
    public boot = 0x1a2b,
    readonly hz = 16_000_000,
  ) {}

  hello(): string {
    return encodeRecord({ kind: 'H', seq: this.next(), proto: 1, fw: '1.0.0', mcu: 'atmega328p', hz: this.hz, ch: 2, boot: this.boot, extra: {} });
  }

  beat(ticks: number, levels = 1, lost = 0): string {
    return encodeRecord({ kind: 'T', seq: this.next(), ticks, lost, levels });
  }

  edge(ticks: number, edge: 'r' | 'f', ch = 0): string {
    return encodeRecord({ kind: 'E', seq: this.next(), ch, edge, ticks });
  }

  reply(cmd: string, fields: string[]): string {
    return encodeRecord({ kind: 'R', seq: this.next(), ok: true, cmd, fields });
  }

  /** A reboot: the sequence restarts at 0 under a new boot id. */
  reboot(boot: number): void {
    this.seq = 0;
    this.boot = boot;
  }

  private next(): number {
    const s = this.seq;
    this.seq = (this.seq + 1) % 0x10000;
    return s;
  }
}
