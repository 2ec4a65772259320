// Global test setup: builds the firmware, its host-side format checker and the simavr harness once per run.
import { execFileSync } from 'node:child_process';
import type { TestProject } from 'vitest/node';
import { buildEmulatorParts, missingToolchain, REPO_ROOT, TOOLCHAIN_PACKAGES } from '../../sim/emulator/toolchain.ts';

declare module 'vitest' {
  export interface ProvidedContext {
    /** true when the AVR toolchain and simavr are installed and the firmware and harness are built. */
    firmwareToolchain: boolean;
  }
}

export default function setup(project: TestProject): void {
  const missing = missingToolchain();
  if (missing.length > 0) {
    if (process.env.CI === 'true') {
      throw new Error(`CI: firmware/emulator toolchain missing (${missing.join(', ')}); apt-get install ${TOOLCHAIN_PACKAGES}`);
    }
    console.log(`Skipping firmware and emulator tests: ${missing.join(', ')} not found (install: sudo apt-get install ${TOOLCHAIN_PACKAGES}).`);
    project.provide('firmwareToolchain', false);
    return;
  }
  buildEmulatorParts();
  execFileSync('make', ['-s', '-C', `${REPO_ROOT}firmware`, 'host-check'], { stdio: 'pipe' });
  project.provide('firmwareToolchain', true);
}
