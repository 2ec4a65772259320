// Checks whether Linux USB autosuspend is on for a port's device: it can silently stop a board's data.
import { readFileSync, realpathSync } from 'node:fs';
import { basename, join } from 'node:path';
import { scanSysfs } from './sysfs-scan.ts';

/** A warning line when the port's USB device has `power/control = auto`, else undefined. */
export function autosuspendWarning(portPath: string, sysRoot = '/'): string | undefined {
  let name: string;
  try {
    name = basename(realpathSync(portPath));
  } catch {
    name = basename(portPath);
  }
  const c = scanSysfs(sysRoot).find((p) => basename(p.path) === name);
  if (!c?.usbDevice) return undefined;
  let control: string;
  try {
    control = readFileSync(join(c.usbDevice, 'power/control'), 'latin1').trim();
  } catch {
    return undefined;
  }
  if (control !== 'auto') return undefined;
  const id = c.vendorId && c.productId ? ` (${c.vendorId}:${c.productId})` : '';
  return `USB autosuspend is on for ${portPath}${id}: the board may stop sending after idle; add the udev rule in hardware-notes/unattended-runs.md`;
}
