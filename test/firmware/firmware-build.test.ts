// The firmware build: warning-free, within the flash/RAM budget, reproducible (the shipped HEX equals a
// fresh build from any directory), and the baud build option with its compile-time error check.
import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { runFirmware } from '../../sim/emulator/run-firmware.ts';
import { REPO_ROOT } from '../../sim/emulator/toolchain.ts';
import { decodeRun } from './emulator-helpers.ts';
import { describeFirmware } from './toolchain-gate.ts';

const SHIPPED = `${REPO_ROOT}firmware/dist/halfswing.hex`;

function make(dir: string, ...args: string[]): { out: string; status: number } {
  const r = spawnSync('make', ['-C', dir, ...args], { encoding: 'utf8' });
  return { out: `${r.stdout}${r.stderr}`, status: r.status ?? -1 };
}

describeFirmware('firmware build', () => {
  let tmp: string;
  let fresh: { out: string; status: number };
  beforeAll(() => {
    tmp = mkdtempSync(join(tmpdir(), 'halfswing-fw-build-'));
    fresh = make(`${REPO_ROOT}firmware`, `BUILD=${join(tmp, 'a')}`);
  });
  afterAll(() => rmSync(tmp, { recursive: true, force: true }));

  it('builds with -Wall -Wextra -Werror and no warning', () => {
    expect(fresh.status).toBe(0);
    expect(fresh.out).toMatch(/-Os -std=gnu11 -Wall -Wextra -Werror/);
    expect(fresh.out).not.toMatch(/warning/i);
  });

  it('fits the budget: flash under 16 KiB, static RAM under 1 KiB (of 32 KiB and 2 KiB, datasheet Features; optiboot keeps 0.5 KiB of the flash)', () => {
    const m = /flash (\d+) bytes .* static RAM (\d+) bytes/.exec(fresh.out);
    expect(m).not.toBeNull();
    expect(Number(m![1])).toBeLessThan(16384);
    expect(Number(m![2])).toBeLessThan(1024);
    // The figure make prints is what avr-size says about the ELF.
    const sizes = execFileSync('avr-size', ['-A', join(tmp, 'a', 'halfswing.elf')], { encoding: 'utf8' });
    const sec = (name: string): number => Number(new RegExp(`^\\${name}\\s+(\\d+)`, 'm').exec(sizes)?.[1] ?? 0);
    expect(Number(m![1])).toBe(sec('.text') + sec('.data'));
    expect(Number(m![2])).toBe(sec('.data') + sec('.bss') + sec('.noinit'));
  });

  it('was built for dist with the toolchain installed here (dist/TOOLCHAIN.txt), so the comparison below is fair', () => {
    const here = execFileSync('make', ['-s', '--no-print-directory', '-C', `${REPO_ROOT}firmware`, 'toolchain'], { encoding: 'utf8' });
    // A different avr-gcc/avr-libc/binutils generates different code: rebuild dist with the recorded one.
    expect(here).toBe(readFileSync(`${REPO_ROOT}firmware/dist/TOOLCHAIN.txt`, 'utf8'));
  });

  it('matches the shipped firmware/dist/halfswing.hex byte for byte (run `make -C firmware dist` after changing the source)', () => {
    expect(readFileSync(join(tmp, 'a', 'halfswing.hex'), 'latin1')).toBe(readFileSync(SHIPPED, 'latin1'));
  });

  it('is reproducible from another directory (no paths or times in the HEX)', () => {
    const copy = join(tmp, 'elsewhere', 'fw');
    cpSync(`${REPO_ROOT}firmware`, copy, { recursive: true, filter: (p) => !p.startsWith(`${REPO_ROOT}firmware/build`) });
    const r = make(copy, 'BUILD=out');
    expect(r.status).toBe(0);
    expect(readFileSync(join(copy, 'out', 'halfswing.hex'), 'latin1')).toBe(readFileSync(SHIPPED, 'latin1'));
  });

  it('refuses a baud rate more than 2.5 % off at 16 MHz (230400: −3.5 %, datasheet USART table)', () => {
    const r = make(`${REPO_ROOT}firmware`, `BUILD=${join(tmp, 'b230')}`, 'BAUD=230400');
    expect(r.status).not.toBe(0);
    expect(r.out).toMatch(/BAUD is more than 2\.5 % off/);
  });

  it('builds BAUD=115200 with U2X0 = 1, UBRR0 = 16: +2.1 % (datasheet USART table), and it still talks', async () => {
    const r = make(`${REPO_ROOT}firmware`, `BUILD=${join(tmp, 'b115')}`, 'BAUD=115200');
    expect(r.status).toBe(0);
    const run = await runFirmware({ edges: [], durationS: 1.2, elfPath: join(tmp, 'b115', 'halfswing.elf'), hostBaud: 115_200 });
    expect([run.ubrr, run.u2x]).toEqual([16, 1]);
    const actual = run.hz / (8 * (run.ubrr + 1));
    expect((actual / 115_200 - 1) * 100).toBeCloseTo(2.12, 2);
    expect(decodeRun(run).map((x) => x.kind)).toEqual(['H', 'S', 'T']);
  });
});
