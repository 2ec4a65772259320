// `halfswing ports` as a process where udevadm cannot be found: serialport's listing fails, the scan answers.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const BIN = fileURLToPath(new URL('../../bin/halfswing.js', import.meta.url));

describe.runIf(process.platform === 'linux')('halfswing ports without udevadm', () => {
  it('falls back to the /dev and /sys scan and says why', () => {
    // An empty PATH hides udevadm from serialport's `spawn('udevadm', ...)`, as in a minimal container.
    const r = spawnSync(process.execPath, [BIN, 'ports', '--json'], { env: { ...process.env, PATH: '' }, encoding: 'utf8' });
    expect(r.status).toBe(0);
    const listing = JSON.parse(r.stdout);
    expect(listing).toMatchObject({ method: 'sysfs', note: 'udevadm is not installed' });
    expect(Array.isArray(listing.ports)).toBe(true);
  });
});
