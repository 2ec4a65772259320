// The simulated device on a real pseudo-terminal: the host opens it as a serial port and commands it.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { SerialPort } from 'serialport';
import { ReadlineParser } from '@serialport/parser-readline';
import { decodeLine } from '../../protocol/index.ts';
import { loadScenario } from '../../sim/index.ts';
import { servePty } from '../../sim/outlets/pty.ts';

function ptyEnabled(): boolean {
  if (spawnSync('socat', ['-V'], { stdio: 'ignore' }).status === 0) return true;
  if (process.env.CI === 'true') throw new Error('socat is missing and CI=true: the sim pty test must run (apt-get install socat)');
  process.stderr.write('skipping sim pty test: socat is not installed (apt-get install socat)\n');
  return false;
}

describe.skipIf(!ptyEnabled())('sim --pty', () => {
  it('streams H, E and T lines and answers ?, P, C and bad commands like the firmware', async () => {
    const ac = new AbortController();
    let ready: (p: string) => void = () => undefined;
    const path = new Promise<string>((r) => (ready = r));
    const served = servePty(loadScenario('club-resonator'), { seed: 3, speed: 4, signal: ac.signal, onReady: (p) => ready(p) });
    const port = new SerialPort({ path: await path, baudRate: 250000 });
    const lines: string[] = [];
    let onLine: () => void = () => undefined;
    port.pipe(new ReadlineParser({ delimiter: '\n', encoding: 'latin1' })).on('data', (l: string) => {
      lines.push(l);
      onLine();
    });
    const waitFor = async (pred: (l: string) => boolean, ms = 5000): Promise<string> => {
      const t0 = Date.now();
      for (;;) {
        const hit = lines.find(pred);
        if (hit) return hit;
        if (Date.now() - t0 > ms) throw new Error(`no matching line in ${ms} ms; got ${lines.slice(-5).join(' | ')}`);
        await new Promise<void>((r) => {
          onLine = r;
          setTimeout(r, 50);
        });
      }
    };
    try {
      await waitFor((l) => l.startsWith('T '));
      const send = async (cmd: string, pred: (l: string) => boolean) => {
        port.write(`${cmd}\n`);
        return waitFor(pred);
      };
      const reply = (re: RegExp) => (l: string) => re.test(l);
      expect(await send('P 500', reply(/^R [0-9a-f]+ ok P ms=500 \*/))).toBeTruthy();
      expect(await send('C 1', reply(/^R [0-9a-f]+ ok C mask=1 \*/))).toBeTruthy();
      expect(await send('C 7', reply(/^R [0-9a-f]+ err C range \*/))).toBeTruthy();
      expect(await send('P 50', reply(/^R [0-9a-f]+ err P range \*/))).toBeTruthy();
      expect(await send('P x', reply(/^R [0-9a-f]+ err P syntax \*/))).toBeTruthy();
      expect(await send('X', reply(/^R [0-9a-f]+ err X unknown \*/))).toBeTruthy();
      expect(await send('P 1000000000000000000', reply(/^R [0-9a-f]+ err P too-long \*/))).toBeTruthy();
      const n = lines.filter((l) => l.startsWith('H ')).length;
      await send('?', () => lines.filter((l) => l.startsWith('H ')).length > n);
      // After P 500, heartbeats come twice per device second.
      const before = lines.length;
      await waitFor(() => lines.slice(before).filter((l) => l.startsWith('T ')).length >= 3);
      const ts = lines.slice(before).filter((l) => l.startsWith('T ')).map((l) => decodeLine(l));
      const ticks = ts.map((d) => (d.ok && d.record.kind === 'T' ? d.record.ticks : NaN));
      expect(Math.abs(ticks[2]! - ticks[1]! - 8e6)).toBeLessThan(16e6 * 200e-6);
      // Every line decodes and the seq runs on without gaps.
      const decoded = lines.map(decodeLine);
      expect(decoded.every((d) => d.ok)).toBe(true);
      decoded.forEach((d, i) => d.ok && expect(d.record.seq).toBe(i));
    } finally {
      await new Promise<void>((r) => port.close(() => r()));
      ac.abort();
      await served;
    }
  });
});
