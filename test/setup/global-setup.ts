// Global test setup: builds what the tests need once per run (the firmware and its emulator harness land here).
export default function setup(): void {}
