// A serial binding for tests that can do what binding-mock cannot: unplug, replug under a new path, answer commands.
import type { BindingInterface, BindingOpenOptions, BindingPort, PortInfo } from '../../../host/link/binding-types.ts';

interface Device {
  info: PortInfo;
  /** Called with each line the host writes (without LF); returns lines to answer with. */
  onCommand?: (cmd: string) => string[];
  port?: FakePort;
}

/** The fake "hardware": devices by path; a test plays the board through `emit` and `unplug`. */
export class FakeBinding implements BindingInterface {
  readonly devices = new Map<string, Device>();
  opens = 0;
  /** Make the next open() calls fail with this error message (a bindings-cpp style message). */
  openError: string | undefined;

  add(path: string, info: Partial<PortInfo> = {}, onCommand?: (cmd: string) => string[]): void {
    this.devices.set(path, {
      info: { manufacturer: undefined, serialNumber: undefined, pnpId: undefined, locationId: undefined, productId: undefined, vendorId: undefined, ...info, path },
      ...(onCommand ? { onCommand } : {}),
    });
  }

  async list(): Promise<PortInfo[]> {
    return [...this.devices.values()].map((d) => d.info);
  }

  async open(options: BindingOpenOptions): Promise<BindingPort> {
    await Promise.resolve();
    if (this.openError) throw new Error(this.openError);
    const d = this.devices.get(options.path);
    if (!d) throw new Error(`Error: No such file or directory, cannot open ${options.path}`);
    if (d.port?.isOpen) throw new Error('Error Resource temporarily unavailable Cannot lock port');
    this.opens++;
    d.port = new FakePort(options, d);
    return d.port as unknown as BindingPort;
  }

  /** The open port at `path` (throws when closed: a test bug). */
  port(path: string): FakePort {
    const p = this.devices.get(path)?.port;
    if (!p?.isOpen) throw new Error(`fake port ${path} is not open`);
    return p;
  }

  isOpen(path: string): boolean {
    return this.devices.get(path)?.port?.isOpen === true;
  }

  /** Pulls the cable: the pending read fails as a disconnect and the device vanishes from list() and open(). */
  unplug(path: string): Device {
    const d = this.devices.get(path);
    if (!d) throw new Error(`no fake device ${path}`);
    this.devices.delete(path);
    d.port?.fail(Object.assign(new Error('ENXIO: no such device or address, read'), { code: 'ENXIO', disconnect: true }));
    return d;
  }

  /** Plugs a device back in, possibly under another path (ttyACM0 → ttyACM1). */
  replug(d: Device, path: string): void {
    this.devices.set(path, { ...d, info: { ...d.info, path }, port: undefined } as Device);
  }
}

/** One open fake port. */
export class FakePort {
  isOpen = true;
  readonly openOptions: Required<BindingOpenOptions>;
  written = '';
  private data = Buffer.alloc(0);
  private gone: Error | undefined;
  private pending: { resolve: () => void; reject: (e: Error) => void } | undefined;

  constructor(
    options: BindingOpenOptions,
    private readonly device: Device,
  ) {
    this.openOptions = { dataBits: 8, lock: true, stopBits: 1, parity: 'none', rtscts: false, xon: false, xoff: false, xany: false, hupcl: true, ...options } as Required<BindingOpenOptions>;
  }

  /** The device sends bytes. */
  emit(bytes: string | Buffer): void {
    if (!this.isOpen) throw new Error('fake port closed');
    this.data = Buffer.concat([this.data, typeof bytes === 'string' ? Buffer.from(bytes, 'latin1') : bytes]);
    const p = this.pending;
    this.pending = undefined;
    p?.resolve();
  }

  /** The device is gone: reads fail with `e` until the host closes the port (as bindings-cpp does on unplug). */
  fail(e: Error): void {
    this.gone = e;
    const p = this.pending;
    this.pending = undefined;
    p?.reject(e);
  }

  async read(buffer: Buffer, offset: number, length: number): Promise<{ buffer: Buffer; bytesRead: number }> {
    while (this.data.length === 0) {
      if (!this.isOpen) throw Object.assign(new Error('port is closed'), { canceled: true });
      if (this.gone) throw this.gone;
      await new Promise<void>((resolve, reject) => (this.pending = { resolve, reject }));
    }
    const n = Math.min(length, this.data.length);
    this.data.copy(buffer, offset, 0, n);
    this.data = this.data.subarray(n);
    return { buffer, bytesRead: n };
  }

  async write(buffer: Buffer): Promise<void> {
    if (!this.isOpen) throw Object.assign(new Error('port is closed'), { canceled: true });
    this.written += buffer.toString('latin1');
    let lf: number;
    while (this.device.onCommand && (lf = this.written.indexOf('\n')) >= 0) {
      const cmd = this.written.slice(0, lf);
      this.written = this.written.slice(lf + 1);
      const answer = this.device.onCommand;
      // Replies are made when they are sent, so their seq follows whatever the test emitted meanwhile.
      setImmediate(() => {
        const replies = answer(cmd);
        if (replies.length > 0 && this.isOpen) this.emit(replies.map((l) => `${l}\n`).join(''));
      });
    }
  }

  async close(): Promise<void> {
    if (!this.isOpen) return;
    this.isOpen = false;
    const p = this.pending;
    this.pending = undefined;
    p?.reject(Object.assign(new Error('port is closed'), { canceled: true }));
  }

  async update(): Promise<void> {}
  async set(): Promise<void> {}
  async get(): Promise<{ cts: boolean; dsr: boolean; dcd: boolean }> {
    return { cts: false, dsr: false, dcd: false };
  }
  async getBaudRate(): Promise<{ baudRate: number }> {
    return { baudRate: this.openOptions.baudRate };
  }
  async flush(): Promise<void> {}
  async drain(): Promise<void> {}
}
