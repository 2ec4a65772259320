// Lists USB serial ports from /dev and /sys directly, for systems without udevadm (containers, minimal images).
import { existsSync, readFileSync, readdirSync, readlinkSync, realpathSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';

/** What is known about one candidate port. */
export interface PortCandidate {
  /** The path to open, e.g. /dev/ttyACM0. */
  readonly path: string;
  readonly manufacturer?: string;
  readonly product?: string;
  readonly serialNumber?: string;
  /** Four lowercase hex digits. */
  readonly vendorId?: string;
  readonly productId?: string;
  /** The stable /dev/serial/by-id link to this port, when udev made one. */
  readonly byId?: string;
  /** The USB device's sysfs folder (it holds power/control), resolved under the scanned root. */
  readonly usbDevice?: string;
}

/** tty names that are USB serial adapters or native USB boards. */
const USB_TTY = /^tty(ACM|USB)\d+$/;

function readAttr(dir: string, name: string): string | undefined {
  try {
    const v = readFileSync(join(dir, name), 'latin1').trim();
    return v === '' ? undefined : v;
  } catch {
    return undefined;
  }
}

/** Walks up from a tty's device folder to the USB device that carries idVendor (≤ 4 levels). */
function usbDeviceOf(deviceDir: string): string | undefined {
  let dir = deviceDir;
  for (let i = 0; i < 4; i++) {
    if (existsSync(join(dir, 'idVendor'))) return dir;
    const up = dirname(dir);
    if (up === dir) return undefined;
    dir = up;
  }
  return undefined;
}

function byIdLinks(root: string): Map<string, string> {
  const map = new Map<string, string>();
  const dir = join(root, 'dev/serial/by-id');
  let names: string[];
  try {
    names = readdirSync(dir);
  } catch {
    return map;
  }
  for (const n of names) {
    try {
      map.set(basename(readlinkSync(join(dir, n))), `/dev/serial/by-id/${n}`);
    } catch {
      // not a link: skip
    }
  }
  return map;
}

/**
 * Scans `<root>/sys/class/tty` for ttyACM/ttyUSB devices and reads their USB attributes; `root` is `/` on a
 * real system and a fake tree in tests. Never throws: an unreadable entry yields a bare path.
 */
export function scanSysfs(root = '/'): PortCandidate[] {
  const ttyDir = join(root, 'sys/class/tty');
  let names: string[];
  try {
    names = readdirSync(ttyDir).filter((n) => USB_TTY.test(n));
  } catch {
    names = [];
  }
  const ids = byIdLinks(root);
  // Also pick up device nodes that sysfs does not show (a bind-mounted /dev in a container).
  try {
    for (const n of readdirSync(join(root, 'dev'))) if (USB_TTY.test(n) && !names.includes(n)) names.push(n);
  } catch {
    // no /dev to scan
  }
  const out: PortCandidate[] = [];
  for (const name of names.sort(naturalOrder)) {
    let usb: string | undefined;
    try {
      usb = usbDeviceOf(realpathSync(join(ttyDir, name, 'device')));
    } catch {
      usb = undefined;
    }
    const byId = ids.get(name);
    const c: PortCandidate = {
      path: `/dev/${name}`,
      ...(usb
        ? {
            manufacturer: readAttr(usb, 'manufacturer'),
            product: readAttr(usb, 'product'),
            serialNumber: readAttr(usb, 'serial'),
            vendorId: readAttr(usb, 'idVendor')?.toLowerCase(),
            productId: readAttr(usb, 'idProduct')?.toLowerCase(),
            usbDevice: usb,
          }
        : {}),
      ...(byId ? { byId } : {}),
    };
    out.push(dropUndefined(c));
  }
  return out;
}

function dropUndefined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

function naturalOrder(a: string, b: string): number {
  return a.localeCompare(b, 'en', { numeric: true });
}
