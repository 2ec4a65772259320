// `halfswing ports`: lists candidate serial ports with what is known about them, and how they were found.
import { listPorts, pickAutoPort, type PortListing } from '../../link/port-list.ts';
import type { Command } from '../command.ts';

/** The listing as text lines: one per port, then how it was found. */
export function formatListing(l: PortListing): string[] {
  const auto = pickAutoPort(l.ports);
  const how =
    l.method === 'udev' ? "serialport's listing (udevadm on Linux)" : `a scan of /dev and /sys${l.note ? ` (${l.note})` : ''}`;
  if (l.ports.length === 0) return [`no serial ports found, by ${how}`, 'plug the board in, or give its path with --port'];
  const rows = l.ports.map((p) => {
    const id = p.vendorId ? `${p.vendorId}:${p.productId ?? '????'}` : '-';
    const what = [p.manufacturer, p.product].filter(Boolean).join(' ') || '-';
    const mark = auto.ok && auto.port.path === p.path ? '  <- auto' : '';
    return { cells: [p.path, id, what, p.serialNumber ? `serial ${p.serialNumber}` : 'no serial number'], tail: `${p.byId ? `  ${p.byId}` : ''}${mark}` };
  });
  const w = [0, 1, 2, 3].map((i) => Math.max(...rows.map((r) => r.cells[i]!.length)));
  return [...rows.map((r) => `${r.cells.map((c, i) => c.padEnd(w[i]!)).join('  ')}${r.tail}`.trimEnd()), `found by ${how}`];
}

export const command: Command = {
  name: 'ports',
  summary: 'list candidate serial ports',
  usage: 'ports [--json]',
  options: { json: { type: 'boolean', description: 'print the listing as JSON' } },
  details: `
Where udevadm is missing (containers, minimal systems) serialport cannot list ports; halfswing then scans
/dev and /sys itself and says so. Boards without a USB serial number (many CH340 clones) are found again
after a replug only by vendor:product, so keep one such board per computer or use its /dev/serial/by-path link.`,
  async run(args, io) {
    const { SerialPort } = await import('serialport');
    const listing = await listPorts({ list: () => SerialPort.list() });
    io.stdout.write(args.values.json ? `${JSON.stringify(listing, null, 2)}\n` : `${formatListing(listing).join('\n')}\n`);
    return 0;
  },
};
