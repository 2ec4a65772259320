import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { findByIdentity, identityOf, listPorts, pickAutoPort } from '../../host/link/port-list.ts';
import { scanSysfs } from '../../host/link/sysfs-scan.ts';

let root: string;
beforeEach(() => (root = mkdtempSync(join(tmpdir(), 'halfswing-sys-'))));
afterEach(() => rmSync(root, { recursive: true, force: true }));

/**
 * Builds the sysfs shape Linux gives a USB CDC-ACM board (ttyACM0: device → the interface folder, whose
 * parent is the USB device with idVendor) and a USB-serial adapter (ttyUSB0: device → a port folder one
 * level further down), as seen on Linux 5.x/6.x (from memory), plus a /dev/serial/by-id link.
 */
function fakeSys(): void {
  const usb = (name: string, attrs: Record<string, string>): string => {
    const d = join(root, 'sys/devices/pci0000:00/0000:00:14.0/usb1', name);
    mkdirSync(d, { recursive: true });
    for (const [k, v] of Object.entries(attrs)) writeFileSync(join(d, k), `${v}\n`);
    mkdirSync(join(d, 'power'), { recursive: true });
    writeFileSync(join(d, 'power/control'), 'auto\n');
    return d;
  };
  const uno = usb('1-1', { idVendor: '2341', idProduct: '0043', serial: '95530343834351A0E1C1', manufacturer: 'Arduino (www.arduino.cc)', product: 'Uno' });
  const ch340 = usb('1-2', { idVendor: '1a86', idProduct: '7523', product: 'USB Serial' });
  mkdirSync(join(uno, '1-1:1.0'), { recursive: true });
  mkdirSync(join(ch340, '1-2:1.0/ttyUSB0'), { recursive: true });
  mkdirSync(join(root, 'sys/class/tty/ttyACM0'), { recursive: true });
  mkdirSync(join(root, 'sys/class/tty/ttyUSB0'), { recursive: true });
  mkdirSync(join(root, 'sys/class/tty/ttyS0'), { recursive: true });
  symlinkSync(join(uno, '1-1:1.0'), join(root, 'sys/class/tty/ttyACM0/device'));
  symlinkSync(join(ch340, '1-2:1.0/ttyUSB0'), join(root, 'sys/class/tty/ttyUSB0/device'));
  mkdirSync(join(root, 'dev/serial/by-id'), { recursive: true });
  for (const n of ['ttyACM0', 'ttyUSB0', 'ttyS0']) writeFileSync(join(root, 'dev', n), '');
  symlinkSync('../../ttyACM0', join(root, 'dev/serial/by-id/usb-Arduino__www.arduino.cc__Uno_95530343834351A0E1C1-if00'));
}

describe('port listing without udevadm', () => {
  it('scans /sys and /dev: USB ttys with vendor, product, serial number and by-id link; no ttyS', () => {
    fakeSys();
    const ports = scanSysfs(root);
    expect(ports.map((p) => p.path)).toEqual(['/dev/ttyACM0', '/dev/ttyUSB0']);
    expect(ports[0]).toMatchObject({
      vendorId: '2341',
      productId: '0043',
      serialNumber: '95530343834351A0E1C1',
      manufacturer: 'Arduino (www.arduino.cc)',
      byId: '/dev/serial/by-id/usb-Arduino__www.arduino.cc__Uno_95530343834351A0E1C1-if00',
    });
    expect(ports[1]).toMatchObject({ vendorId: '1a86', productId: '7523' });
    expect(ports[1]!.serialNumber).toBeUndefined();
    expect(ports[0]!.usbDevice).toMatch(/usb1\/1-1$/);
  });

  it('falls back to the scan when serialport listing cannot spawn udevadm, and says so', async () => {
    fakeSys();
    const enoent = Object.assign(new Error('spawn udevadm ENOENT'), { code: 'ENOENT' });
    const r = await listPorts({ list: () => Promise.reject(enoent), sysRoot: root, platform: 'linux' });
    expect(r.method).toBe('sysfs');
    expect(r.note).toBe('udevadm is not installed');
    expect(r.ports).toHaveLength(2);
  });

  it('uses serialport listing when it works, filling gaps from the scan', async () => {
    fakeSys();
    const listed = [
      { path: '/dev/ttyS0', manufacturer: undefined, serialNumber: undefined, pnpId: undefined, locationId: undefined, vendorId: undefined, productId: undefined },
      { path: '/dev/ttyACM0', manufacturer: undefined, serialNumber: undefined, pnpId: undefined, locationId: undefined, vendorId: undefined, productId: undefined },
    ];
    const r = await listPorts({ list: async () => listed, sysRoot: root, platform: 'linux' });
    expect(r.method).toBe('udev');
    expect(r.ports.map((p) => p.path)).toEqual(['/dev/ttyACM0', '/dev/ttyUSB0', '/dev/ttyS0']);
    expect(r.ports[0]!.serialNumber).toBe('95530343834351A0E1C1');
  });

  it('an empty or missing tree gives no ports, not an error', () => {
    expect(scanSysfs(join(root, 'nothing'))).toEqual([]);
  });
});

describe('finding the board again', () => {
  const a = { path: '/dev/ttyACM1', vendorId: '2341', productId: '0043', serialNumber: 'S1' };
  const clone = { path: '/dev/ttyUSB3', vendorId: '1a86', productId: '7523' };
  it('by serial number after the path changed', () => {
    expect(findByIdentity([clone, a], identityOf({ ...a, path: '/dev/ttyACM0' })!)?.path).toBe('/dev/ttyACM1');
  });
  it('by vendor:product when a clone has no serial number and is the only one of its kind', () => {
    expect(findByIdentity([a, clone], identityOf({ ...clone, path: '/dev/ttyUSB0' })!)?.path).toBe('/dev/ttyUSB3');
    expect(findByIdentity([a, clone, { ...clone, path: '/dev/ttyUSB4' }], identityOf(clone)!)).toBeUndefined();
  });
  it('auto picks the one board, and explains otherwise', () => {
    expect(pickAutoPort([{ path: '/dev/ttyS0' }, a])).toEqual({ ok: true, port: a });
    expect(pickAutoPort([{ path: '/dev/ttyS0' }])).toMatchObject({ ok: false, why: /no USB serial port/ });
  });
});
