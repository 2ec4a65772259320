// Lists candidate serial ports: serialport's own listing first, the /dev and /sys scan where that fails.
import type { PortInfo } from './binding-types.ts';
import { scanSysfs, type PortCandidate } from './sysfs-scan.ts';

export type { PortCandidate } from './sysfs-scan.ts';

/** The ports found and how they were found. */
export interface PortListing {
  readonly ports: readonly PortCandidate[];
  /** `udev`: serialport's listing (udevadm on Linux, the OS API elsewhere); `sysfs`: our scan of /dev and /sys. */
  readonly method: 'udev' | 'sysfs';
  /** Why the fallback was used, when it was. */
  readonly note?: string;
}

export interface ListOptions {
  /** serialport's `list()` (the binding's); omitted on systems where only the scan should run. */
  readonly list?: () => Promise<PortInfo[]>;
  /** Root of the file system to scan (a fake tree in tests). */
  readonly sysRoot?: string;
  readonly platform?: NodeJS.Platform;
}

const USB_FIRST = (p: PortCandidate): number => (p.vendorId ? 0 : 1);

/**
 * serialport's Linux listing shells out to `udevadm`; where that is missing (containers) it rejects with
 * ENOENT, and where udev has no data it returns bare paths. Both fall back to, or are filled in from, the scan.
 */
export async function listPorts(opts: ListOptions = {}): Promise<PortListing> {
  const platform = opts.platform ?? process.platform;
  const scan = (): PortCandidate[] => (platform === 'linux' ? scanSysfs(opts.sysRoot) : []);
  if (!opts.list) return { ports: scan(), method: 'sysfs', note: 'no serialport listing given' };
  let listed: PortInfo[];
  try {
    listed = await opts.list();
  } catch (e) {
    const why = (e as NodeJS.ErrnoException).code === 'ENOENT' ? 'udevadm is not installed' : `serialport listing failed (${(e as Error).message})`;
    return { ports: scan(), method: 'sysfs', note: why };
  }
  const scanned = new Map(scan().map((c) => [c.path, c]));
  const ports = listed.map((p): PortCandidate => {
    const s = scanned.get(p.path);
    scanned.delete(p.path);
    return clean({
      path: p.path,
      manufacturer: p.manufacturer ?? s?.manufacturer,
      product: s?.product,
      serialNumber: p.serialNumber ?? s?.serialNumber,
      vendorId: p.vendorId?.toLowerCase() ?? s?.vendorId,
      productId: p.productId?.toLowerCase() ?? s?.productId,
      byId: s?.byId ?? (p.pnpId ? `/dev/serial/by-id/${p.pnpId}` : undefined),
      usbDevice: s?.usbDevice,
    });
  });
  // A USB port the scan sees but udev did not report (udev data missing in a container).
  ports.push(...scanned.values());
  return { ports: [...ports].sort((a, b) => USB_FIRST(a) - USB_FIRST(b)), method: 'udev' };
}

/** A stable identity of a board's port, to find it again when its path changes after a replug. */
export interface PortIdentity {
  readonly serialNumber?: string;
  readonly vendorId?: string;
  readonly productId?: string;
  readonly byId?: string;
}

/** The identity worth remembering for a port, or undefined when nothing stable is known. */
export function identityOf(c: PortCandidate): PortIdentity | undefined {
  if (!c.serialNumber && !c.vendorId && !c.byId) return undefined;
  return clean({ serialNumber: c.serialNumber, vendorId: c.vendorId, productId: c.productId, byId: c.byId });
}

/**
 * Finds the port of a remembered identity: by serial number (with vendor:product when both are known), else by
 * the by-id link, else by vendor:product alone when exactly one port has it (clones without serial numbers).
 */
export function findByIdentity(ports: readonly PortCandidate[], id: PortIdentity): PortCandidate | undefined {
  if (id.serialNumber) {
    const m = ports.filter((p) => p.serialNumber === id.serialNumber && (!id.vendorId || !p.vendorId || p.vendorId === id.vendorId));
    if (m.length >= 1) return m[0];
  }
  if (id.byId) {
    const m = ports.find((p) => p.byId === id.byId);
    if (m) return m;
  }
  if (id.vendorId && id.productId && !id.serialNumber) {
    const m = ports.filter((p) => p.vendorId === id.vendorId && p.productId === id.productId);
    if (m.length === 1) return m[0];
  }
  return undefined;
}

/** Board vendor IDs seen on ATmega328P boards: Arduino, FTDI, WCH (CH340), Silicon Labs (CP210x). From memory. */
const BOARD_VENDORS = new Set(['2341', '2a03', '0403', '1a86', '10c4']);

/** Picks the one likely board for `--port auto`, or explains why none or several fit. */
export function pickAutoPort(ports: readonly PortCandidate[]): { ok: true; port: PortCandidate } | { ok: false; why: string } {
  const usb = ports.filter((p) => p.vendorId !== undefined || /tty(ACM|USB)/.test(p.path));
  const boards = usb.filter((p) => p.vendorId !== undefined && BOARD_VENDORS.has(p.vendorId));
  const pool = boards.length > 0 ? boards : usb;
  if (pool.length === 1) return { ok: true, port: pool[0]! };
  if (pool.length === 0) return { ok: false, why: 'no USB serial port found (is the board plugged in? see halfswing ports)' };
  return { ok: false, why: `${pool.length} candidate ports (${pool.map((p) => p.path).join(', ')}): pass one with --port` };
}

function clean<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}
