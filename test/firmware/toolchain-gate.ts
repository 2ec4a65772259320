// Gate for firmware tests: run them when global setup built the toolchain parts, else skip (never in CI).
import { describe, inject } from 'vitest';

/** `describe` when the firmware toolchain is there; `describe.skip` otherwise (global setup printed why). */
export const describeFirmware = inject('firmwareToolchain') ? describe : describe.skip;
