// Bad input to `halfswing record`: each gets one clear line, a non-zero exit, and loses nothing.
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { SerialPort } from 'serialport';
import { beforeEach, describe, expect, it } from 'vitest';
import { encodeRecord } from '../../protocol/encode.ts';
import { DeviceLines } from '../link/helpers/device-lines.ts';
import { PtyCable, ptyTestsEnabled } from './helpers/pty-device.ts';
import { usePtyFixture } from './helpers/pty-fixture.ts';
import { journalDataLines, journalText, waitFor, type RecorderChild } from './helpers/recorder-process.ts';

const enabled = ptyTestsEnabled();

const fx = usePtyFixture('halfswing-bad-', ['--hello-timeout', '1.5', '--interval', '0.25']);
const record = fx.record;
const plug = (): Promise<PtyCable> => fx.plug('ttyX');
let dir: string;
let rigPath: string;
beforeEach(() => {
  dir = fx.dir();
  rigPath = join(dir, 'rig.json');
  writeFileSync(rigPath, JSON.stringify({ length_m: 1, flag_width_m: 0.02 }));
});

/** The recorder's last stderr line (its error). */
const lastLine = (c: RecorderChild): string => c.stderr().trim().split('\n').at(-1)!;

describe('record: bad input without a port', () => {
  it('a rig file with a typo names the key, before any port is opened', async () => {
    writeFileSync(rigPath, JSON.stringify({ lenght_m: 1, flag_width_m: 0.02 }));
    const c = record(['--port', join(dir, 'nope'), '--rig', rigPath, '--journal', join(dir, 'j')]);
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toBe(`halfswing: rig file ${rigPath}: unknown rig key "lenght_m" (did you mean "length_m"?)`);
    expect(existsSync(join(dir, 'j'))).toBe(false);
  });

  it('a journal in a folder that does not exist fails before the port, which is missing too', async () => {
    const c = record(['--port', join(dir, 'nope'), '--rig', rigPath, '--journal', join(dir, 'no', 'j')]);
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toMatch(/cannot write journal .*folder .*no does not exist/);
  });

  it('a file of another format is refused and left untouched', async () => {
    const notes = join(dir, 'notes.txt');
    writeFileSync(notes, 'precious\n');
    const c = record(['--port', join(dir, 'nope'), '--rig', rigPath, '--journal', notes]);
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toMatch(/is not a halfswing journal .*refusing/);
    expect(readFileSync(notes, 'utf8')).toBe('precious\n');
  });

  it('a port that does not exist: one line, exit 1, no journal left behind', async () => {
    const c = record(['--port', join(dir, 'ttyNOPE'), '--rig', rigPath, '--journal', join(dir, 'j')]);
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toMatch(/no serial port .*ttyNOPE: check the cable/);
    expect(c.stderr()).not.toMatch(/\n\s+at /);
    expect(existsSync(join(dir, 'j'))).toBe(false);
  });

  it('missing --rig is a usage error (exit 2)', async () => {
    const c = record(['--port', 'auto', '--journal', join(dir, 'j')]);
    expect(await c.exited).toBe(2);
    expect(lastLine(c)).toMatch(/--rig FILE is required/);
  });
});

describe.skipIf(!enabled)('record: bad devices on a pty', () => {
  it('a busy port (another program holds it) says so', async () => {
    const cable = await plug();
    const holder = new SerialPort({ path: cable.path, baudRate: 250000 });
    await new Promise<void>((r, j) => holder.once('open', () => r()).once('error', j));
    try {
      const c = record(['--port', cable.path, '--rig', rigPath, '--journal', join(dir, 'j')]);
      expect(await c.exited).toBe(1);
      expect(lastLine(c)).toMatch(/is busy: another program holds it/);
    } finally {
      await new Promise((r) => holder.close(r));
    }
  });

  it('a device that speaks something else', async () => {
    const cable = await plug();
    const c = record(['--port', cable.path, '--rig', rigPath, '--journal', join(dir, 'j')]);
    await new Promise((r) => cable.onCommand(r));
    for (let i = 0; i < 5; i++) await cable.write(`Temperature: 21.${i} C\r\n`);
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toMatch(/speaks something else: 5 lines .*"Temperature: 21.0 C"/);
    expect(existsSync(join(dir, 'j'))).toBe(false);
  });

  it('a wrong baud (bytes without line structure) suggests the baud', async () => {
    const cable = await plug();
    const c = record(['--port', cable.path, '--rig', rigPath, '--journal', join(dir, 'j')]);
    await new Promise((r) => cable.onCommand(r));
    // What 250000-baud text looks like read at another speed: mostly high, framing-broken bytes, no LF.
    await cable.write(Buffer.from(Array.from({ length: 3000 }, (_, i) => 0x80 | ((i * 53) & 0x7f) | (i % 3 === 0 ? 1 : 0)).filter((b) => b !== 0x0a)));
    expect(await c.exited).toBe(1);
    expect(lastLine(c)).toMatch(/not text lines at 250000 baud: probably the wrong baud/);
  });

  it('a flooding device is warned about and noted in the journal, and every line is kept (stdin closed)', async () => {
    const cable = await plug();
    const journal = join(dir, 'j');
    const c = record(['--port', cable.path, '--rig', rigPath, '--journal', journal], { closedStdin: true });
    await new Promise((r) => cable.onCommand(r));
    const d = new DeviceLines();
    const sent = [d.hello()];
    await cable.write(`${sent[0]}\n`);
    // 20 000 heartbeat-sized lines as fast as the pty takes them: far above the 500 lines/s default.
    for (let i = 0; i < 20_000; i++) {
      const l = encodeRecord({ kind: 'E', seq: d.seq++ % 0x10000, ch: 0, edge: i % 2 ? 'r' : 'f', ticks: 1000 + i * 100 });
      sent.push(l);
      await cable.write(`${l}\n`);
      if (i % 2000 === 0) await new Promise((r) => setTimeout(r, 60));
    }
    await waitFor(() => journalDataLines(journal).length === sent.length, 'every line');
    await waitFor(() => /device is flooding/.test(c.stderr()), 'flood warning');
    c.proc.kill('SIGHUP');
    expect(await c.exited).toBe(0);
    expect(journalDataLines(journal)).toEqual(sent);
    expect(journalText(journal)).toMatch(/\n#@\d+ note device flooding: \d+ lines\/s\n/);
  });
});
