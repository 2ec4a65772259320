// The list of CLI commands, loaded lazily so that `halfswing analyze` does not pay for ink or serialport.
import type { Command } from './command.ts';

export interface CommandEntry {
  readonly name: string;
  readonly summary: string;
  readonly load: () => Promise<Command>;
}

const load = (p: Promise<{ command: Command }>): Promise<Command> => p.then((m) => m.command);

export const COMMANDS: readonly CommandEntry[] = [
  { name: 'demo', summary: 'watch a simulated rig swing, live (the default of npm start)', load: () => load(import('./commands/demo.ts')) },
  { name: 'live', summary: 'record from a board and show the swing live', load: () => load(import('./commands/live.ts')) },
  { name: 'watch', summary: 'follow or replay a journal on screen, never touching the port', load: () => load(import('./commands/watch.ts')) },
  { name: 'record', summary: 'record a board unattended into a journal, for hours or days', load: () => load(import('./commands/record.ts')) },
  { name: 'analyze', summary: 'analyse a journal: period vs amplitude, T0, g with uncertainty, Q', load: () => load(import('./commands/analyze.ts')) },
  { name: 'combine', summary: 'g from several journals: two lengths of one bob, or a reversible pendulum about both edges', load: () => load(import('./commands/combine.ts')) },
  { name: 'sim', summary: 'simulate a pendulum rig and its device, to a journal, a pty or stdout', load: () => load(import('./commands/sim.ts')) },
  { name: 'ports', summary: 'list candidate serial ports', load: () => load(import('./commands/ports.ts')) },
  { name: 'probe', summary: 'check a board: hello, heartbeats, line errors, gate levels', load: () => load(import('./commands/probe.ts')) },
];
