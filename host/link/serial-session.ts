// One open serial port on serialport 13's SerialPortStream with an injected binding: raw bytes in, text out, loss reported once.
import type { BindingInterface } from './binding-types.ts';
import { SerialPortStream } from '@serialport/stream';

export interface SessionOptions {
  readonly path: string;
  readonly baud: number;
  readonly binding: BindingInterface;
  /**
   * Drop DTR when the port closes (serialport's default, true). Linux and macOS always raise DTR on open, which
   * resets most ATmega328P boards; with `hupcl: false` DTR stays up after close, so the next open does not
   * pulse it and does not reset the board. The first open after plug-in still does.
   */
  readonly hupcl?: boolean;
}

/** An open port. Call `onData` and `onLost` right after opening; `close` is idempotent. */
export interface SerialSession {
  readonly path: string;
  onData(fn: (chunk: Buffer) => void): void;
  /** Called once, when the port errors or closes by itself (unplug, read error). */
  onLost(fn: (reason: string) => void): void;
  write(text: string): Promise<void>;
  pause(): void;
  resume(): void;
  close(): Promise<void>;
}

/** Opens a port; rejects with the binding's own error (see open-errors.ts to explain it). */
export function openSession(opts: SessionOptions): Promise<SerialSession> {
  const port = new SerialPortStream({
    binding: opts.binding,
    path: opts.path,
    baudRate: opts.baud,
    autoOpen: false,
    hupcl: opts.hupcl ?? true,
    lock: true,
  });
  return new Promise((resolve, reject) => {
    port.open((err) => {
      if (err) {
        port.removeAllListeners();
        reject(err);
        return;
      }
      resolve(wrap(port, opts.path));
    });
  });
}

function wrap(port: SerialPortStream, path: string): SerialSession {
  let lostFn: ((reason: string) => void) | undefined;
  let closing = false;
  let lost = false;
  const lose = (reason: string): void => {
    if (closing || lost) return;
    lost = true;
    lostFn?.(reason);
  };
  // Without an 'error' listener a stream error would crash the process.
  port.on('error', (e: Error) => lose(`port error: ${e.message}`));
  port.on('close', (e: (Error & { disconnected?: boolean }) | null) => {
    if (e?.disconnected) lose(`disconnected: ${e.message}`);
    else lose('port closed');
  });
  port.on('end', () => lose('port ended'));
  return {
    path,
    onData(fn) {
      port.on('data', fn);
    },
    onLost(fn) {
      lostFn = fn;
    },
    write(text) {
      return new Promise((resolve, reject) => {
        if (!port.isOpen) {
          reject(new Error('port is not open'));
          return;
        }
        port.write(text, 'latin1', (e) => (e ? reject(e) : resolve()));
      });
    },
    pause() {
      port.pause();
    },
    resume() {
      port.resume();
    },
    close() {
      closing = true;
      return new Promise<void>((resolve) => {
        port.removeAllListeners('data');
        if (!port.isOpen) {
          resolve();
          return;
        }
        port.close(() => resolve());
      }).then(() => {
        port.removeAllListeners();
        // A late error from the closed port must not crash anything.
        port.on('error', () => {});
      });
    },
  };
}
