// Global setup of `npm run test:quick`: builds nothing and tells the firmware tests the toolchain is not in use.
import type { TestProject } from 'vitest/node';

export default function setup(project: TestProject): void {
  project.provide('firmwareToolchain', false);
}
