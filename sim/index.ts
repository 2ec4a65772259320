// Public surface of the simulator: scenarios, simulated journals and their truth, pacing, outlets.
export { parseScenario, applyOverrides, ScenarioError } from './scenario.ts';
export type { Scenario, ScenarioOverrides, Faults } from './scenario.ts';
export { listScenarios, loadScenario, DEFAULT_SCENARIO, SCENARIO_DIR } from './outlets/scenario-files.ts';
export { simulateJournal, simulateEntries, simulateDevice, simulatePinEdges } from './simulate.ts';
export type { SimOptions } from './simulate.ts';
export type { SimEntry } from './link.ts';
export type { Truth, FaultCounts, BootTruth } from './truth.ts';
export { truthJson } from './truth.ts';
export type { TruePhysics } from './physics.ts';
export { truePhysics } from './physics.ts';
export { Rng } from './prng.ts';
export { paceLines, lineHostUs } from './pace.ts';
export type { PaceOptions } from './pace.ts';
export { writeScenarioJournal, truthPathFor } from './outlets/journal-file.ts';
export { firmwareSchedule } from './firmware-schedule.ts';
export type { FirmwareSchedule, ScheduleEdge } from './firmware-schedule.ts';
export type { DeviceModel, DeviceLine } from './device.ts';
