// Turns the serial binding's open failures into one actionable line each (missing, busy, no permission).

/** Why a port could not be opened, as far as the binding's message tells. */
type OpenFailure = 'missing' | 'busy' | 'permission' | 'not-a-tty' | 'other';

/**
 * Classifies an open error. bindings-cpp reports errno only as text, e.g.
 * "Error: No such file or directory, cannot open /dev/ttyACM0" and
 * "Error Resource temporarily unavailable Cannot lock port" (src/serialport_unix.cpp, 13.0.0).
 */
function classifyOpenError(e: unknown): OpenFailure {
  const err = e as { code?: string; message?: string } | undefined;
  const msg = `${err?.code ?? ''} ${err?.message ?? String(e)}`;
  if (/ENOENT|No such file or directory/i.test(msg)) return 'missing';
  if (/Cannot lock port|EBUSY|Device or resource busy|Resource temporarily unavailable|EAGAIN/i.test(msg)) return 'busy';
  if (/EACCES|EPERM|Permission denied|Operation not permitted/i.test(msg)) return 'permission';
  if (/ENOTTY|Inappropriate ioctl/i.test(msg)) return 'not-a-tty';
  return 'other';
}

/** One line saying what to do about an open failure. */
export function openErrorMessage(path: string, e: unknown, platform: NodeJS.Platform = process.platform): string {
  const raw = ((e as Error | undefined)?.message ?? String(e)).split('\n')[0];
  switch (classifyOpenError(e)) {
    case 'missing':
      return `no serial port ${path}: check the cable, then run 'halfswing ports' to see what is attached`;
    case 'busy':
      return `${path} is busy: another program holds it (a serial monitor, another halfswing, ModemManager); close it and retry${platform === 'linux' ? ` ('fuser ${path}' shows which)` : ''}`;
    case 'permission':
      return platform === 'linux'
        ? `permission denied on ${path}: join the group that owns it (usually 'dialout': sudo usermod -aG dialout $USER, then log out and in)`
        : `permission denied on ${path}: give your user access to the serial device`;
    case 'not-a-tty':
      return `${path} is not a serial port`;
    case 'other':
      return `cannot open ${path}: ${raw}`;
  }
}
