// `sim --firmware` refuses what it cannot do in one line: a scenario at another baud rate than the shipped
// firmware's, and a machine without the emulator's toolchain (the lookup sees an empty PATH here).
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable, Writable } from 'node:stream';
import { afterAll, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';
import { DEFAULT_BAUD } from '../../protocol/link-defaults.ts';
import { loadScenario } from '../../sim/index.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-sim-fw-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function cli(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const sink = (f: (s: string) => void) => new Writable({ write: (c, _e, cb) => (f(String(c)), cb()) });
  const code = await runCli(argv, { stdout: sink((s) => (out += s)), stderr: sink((s) => (err += s)), stdin: Readable.from([]), env: {}, cwd: dir });
  return { code, out, err };
}

function oneLine(r: { code: number; out: string; err: string }): string {
  expect(r.code).not.toBe(0);
  expect(r.out).toBe('');
  expect(r.err.trimEnd().split('\n')).toHaveLength(1);
  expect(r.err).not.toMatch(/\n\s+at /);
  return r.err.trim();
}

it('a scenario at another baud rate than the shipped firmware is refused in one line, before anything is written', async () => {
  expect(loadScenario('club-resonator').device.baud).not.toBe(DEFAULT_BAUD);
  const journal = join(dir, 'club.journal');
  const line = oneLine(await cli(['sim', '-s', 'club-resonator', '--firmware', '-o', journal, '--duration', '10s']));
  expect(line).toContain(`links at ${DEFAULT_BAUD} baud, the scenario's device at 115200`);
  expect(existsSync(journal)).toBe(false);
});

it('a missing toolchain (avr-gcc, make, cc not on PATH) is one line naming what to install', async () => {
  const path = process.env.PATH;
  process.env.PATH = join(dir, 'empty-bin');
  try {
    const journal = join(dir, 'demo.journal');
    const line = oneLine(await cli(['sim', '-s', 'demo-low-q', '--firmware', '-o', journal, '--duration', '10s']));
    expect(line).toMatch(/^halfswing: sim --firmware: the firmware emulator needs make, avr-gcc, cc \(install: apt-get install gcc-avr avr-libc simavr libsimavr-dev libelf-dev\)$/);
    expect(existsSync(journal)).toBe(false);
  } finally {
    process.env.PATH = path;
  }
});
