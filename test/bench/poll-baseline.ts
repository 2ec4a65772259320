// Builds the polling-loop baseline firmware (test/bench/poll-baseline/) with avr-gcc, with the product's UART settings.
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import { REPO_ROOT } from './benchmark.ts';

/** Builds the baseline into `dir` with UBRR0 = `ubrr` and U2X0 = `u2x`; returns the ELF's path. Throws on a failed build. */
export function buildPollBaseline(dir: string, ubrr: number, u2x: 0 | 1): string {
  execFileSync('make', ['-s', '-C', join(REPO_ROOT, 'test', 'bench', 'poll-baseline'), `BUILD=${dir}`, `UBRR=${ubrr}`, `U2X=${u2x}`], { stdio: 'pipe' });
  return join(dir, 'poll-baseline.elf');
}
