import { EventEmitter } from 'node:events';
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough } from 'node:stream';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { holdSleepInhibitor } from '../../host/link/sleep-inhibitor.ts';
import { autosuspendWarning } from '../../host/link/usb-power.ts';
import { formatListing } from '../../host/cli/commands/ports.ts';

/** A stand-in for a spawned systemd-inhibit: stays up, or exits at once with an error text. */
function fakeSpawn(behaviour: 'up' | 'fail' | 'missing', calls: string[][]) {
  return ((cmd: string, args: string[]) => {
    calls.push([cmd, ...args]);
    const child = Object.assign(new EventEmitter(), {
      stdin: new PassThrough(),
      stderr: new PassThrough(),
      killed: false,
      unref() {},
      kill() {
        child.killed = true;
        return true;
      },
    });
    setImmediate(() => {
      if (behaviour === 'fail') {
        child.stderr.write('Failed to connect to bus: No such file or directory\n');
        setImmediate(() => child.emit('exit', 1));
      }
      if (behaviour === 'missing') child.emit('error', Object.assign(new Error('spawn systemd-inhibit ENOENT'), { code: 'ENOENT' }));
    });
    return child;
  }) as never;
}

describe('sleep inhibitor', () => {
  it('holds systemd-inhibit for sleep and idle with cat on a pipe from us, and releases it', async () => {
    const calls: string[][] = [];
    const inh = await holdSleepInhibitor({ why: 'recording x', spawn: fakeSpawn('up', calls), settleMs: 20, platform: 'linux' });
    expect(inh.held).toBe(true);
    expect(calls[0]).toEqual(['systemd-inhibit', '--what=sleep:idle', '--who=halfswing record', '--why=recording x', '--mode=block', 'cat']);
    inh.release();
  });
  it('says why when there is none: no logind bus, not installed, another OS', async () => {
    const fail = await holdSleepInhibitor({ why: 'x', spawn: fakeSpawn('fail', []), settleMs: 200, platform: 'linux' });
    expect(fail).toMatchObject({ held: false, note: expect.stringMatching(/no sleep inhibitor \(Failed to connect to bus/) });
    const missing = await holdSleepInhibitor({ why: 'x', spawn: fakeSpawn('missing', []), settleMs: 200, platform: 'linux' });
    expect(missing.note).toMatch(/systemd-inhibit is not installed/);
    expect((await holdSleepInhibitor({ why: 'x', platform: 'darwin' })).note).toMatch(/no sleep inhibitor on darwin/);
  });
});

describe('USB autosuspend check', () => {
  let root: string;
  beforeEach(() => (root = mkdtempSync(join(tmpdir(), 'halfswing-pm-'))));
  afterEach(() => rmSync(root, { recursive: true, force: true }));

  function board(control: string): string {
    const usb = join(root, 'sys/devices/usb1/1-1');
    mkdirSync(join(usb, '1-1:1.0'), { recursive: true });
    mkdirSync(join(usb, 'power'), { recursive: true });
    writeFileSync(join(usb, 'idVendor'), '2341\n');
    writeFileSync(join(usb, 'idProduct'), '0043\n');
    writeFileSync(join(usb, 'power/control'), `${control}\n`);
    mkdirSync(join(root, 'sys/class/tty/ttyACM0'), { recursive: true });
    symlinkSync(join(usb, '1-1:1.0'), join(root, 'sys/class/tty/ttyACM0/device'));
    return '/dev/ttyACM0';
  }

  it('warns when power/control is auto, naming the device and the fix', () => {
    expect(autosuspendWarning(board('auto'), root)).toBe(
      'USB autosuspend is on for /dev/ttyACM0 (2341:0043): the board may stop sending after idle; add the udev rule in hardware-notes/unattended-runs.md',
    );
  });
  it('is quiet when it is on, or when the device is not USB', () => {
    expect(autosuspendWarning(board('on'), root)).toBeUndefined();
    expect(autosuspendWarning('/dev/ttyS0', root)).toBeUndefined();
  });
});

describe('ports listing text', () => {
  it('one row per port, the auto pick marked, and the method said', () => {
    const text = formatListing({
      method: 'sysfs',
      note: 'udevadm is not installed',
      ports: [
        { path: '/dev/ttyACM0', vendorId: '2341', productId: '0043', manufacturer: 'Arduino', serialNumber: 'S1', byId: '/dev/serial/by-id/usb-x' },
        { path: '/dev/ttyS0' },
      ],
    });
    expect(text[0]).toBe('/dev/ttyACM0  2341:0043  Arduino  serial S1         /dev/serial/by-id/usb-x  <- auto');
    expect(text[1]).toBe('/dev/ttyS0    -          -        no serial number');
    expect(text.at(-1)).toBe('found by a scan of /dev and /sys (udevadm is not installed)');
    expect(formatListing({ method: 'udev', ports: [] })[0]).toMatch(/no serial ports found/);
  });
});
