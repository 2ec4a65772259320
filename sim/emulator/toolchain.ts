// Finds and builds what the emulator runs need: avr-gcc for the firmware, cc + libsimavr for the harness.
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

/** Repository root, found from this file's place in sim/emulator/. */
export const REPO_ROOT = fileURLToPath(new URL('../../', import.meta.url));
export const FIRMWARE_ELF = `${REPO_ROOT}firmware/build/halfswing.elf`;
export const FIRMWARE_HEX = `${REPO_ROOT}firmware/build/halfswing.hex`;
export const HARNESS_BIN = `${REPO_ROOT}sim/emulator/build/halfswing-emu`;

/** Debian packages that provide the toolchain, for the "how to install" line. */
export const TOOLCHAIN_PACKAGES = 'gcc-avr avr-libc simavr libsimavr-dev libelf-dev';

function onPath(cmd: string): boolean {
  try {
    execFileSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

/** What is missing to build and run the firmware in the emulator (empty when all is there). */
export function missingToolchain(): string[] {
  const missing: string[] = [];
  if (!onPath('make')) missing.push('make');
  if (!onPath('avr-gcc')) missing.push('avr-gcc');
  if (!existsSync('/usr/lib/avr/include/avr/io.h') && !existsSync('/usr/avr/include/avr/io.h')) missing.push('avr-libc');
  if (!onPath('cc')) missing.push('cc');
  if (!existsSync('/usr/include/simavr/sim_avr.h')) missing.push('libsimavr-dev');
  if (!existsSync('/usr/include/libelf.h') && !existsSync('/usr/include/libelf/libelf.h')) missing.push('libelf-dev');
  return missing;
}

let built = false;

/**
 * Builds the firmware ELF/HEX and the harness with make (idempotent: make skips what is up to date).
 * Throws with make's output when a build fails.
 */
export function buildEmulatorParts(): void {
  if (built && existsSync(FIRMWARE_ELF) && existsSync(HARNESS_BIN)) return;
  for (const dir of ['firmware', 'sim/emulator']) {
    try {
      execFileSync('make', ['-s', '-C', `${REPO_ROOT}${dir}`], { stdio: 'pipe' });
    } catch (e) {
      const err = e as { stdout?: Buffer; stderr?: Buffer };
      throw new Error(`make -C ${dir} failed:\n${err.stdout?.toString() ?? ''}${err.stderr?.toString() ?? ''}`);
    }
  }
  built = true;
}
