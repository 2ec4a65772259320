// `halfswing demo`: the simulated rig in the live view, the default of `npm start`.
import type { Command } from '../command.ts';
import { optNumber, optString } from '../command.ts';
import { UserError } from '../../errors.ts';
import { processViewIo } from './view-process.ts';

/**
 * ×5: the demo scenario (Q ≈ 200, released at 35°) decays to the beam's width in about 280 s of swing,
 * so at five times real time a newcomer sees the whole decay and the period–amplitude curve within a minute.
 */
export const DEMO_SPEED = 5;

export const command: Command = {
  name: 'demo',
  summary: 'watch a simulated rig swing, live (the default of npm start)',
  usage: 'demo [--scenario NAME|FILE] [--speed N] [--seed N]',
  options: {
    scenario: { type: 'string', arg: 'NAME|FILE', description: 'a bundled scenario (see halfswing sim --help) or a scenario JSON file', default: 'demo-low-q' },
    speed: { type: 'string', arg: 'N', description: 'times real time', default: String(DEMO_SPEED) },
    seed: { type: 'string', arg: 'N', description: 'random seed of the simulation (same seed, same run)', default: '1' },
  },
  details: `
Keys: q quit, p pause the display, r restart the estimates from now, ? help.
Without a terminal (piped, CI) it prints a plain status line every few seconds instead, until the run ends.`,
  async run(args, io) {
    const speed = optNumber(args, 'speed', { min: 0.1, max: 10_000 }) ?? DEMO_SPEED;
    const seed = optNumber(args, 'seed', { integer: true, min: 0, max: 2 ** 32 - 1 }) ?? 1;
    const name = optString(args, 'scenario') ?? 'demo-low-q';
    const sim = await import('../../../sim/index.ts');
    const { paceLines } = await import('../../../sim/pace.ts');
    let scenario;
    try {
      scenario = sim.loadScenario(name, io.cwd);
    } catch (e) {
      if (e instanceof sim.ScenarioError) throw new UserError(e.message, 2);
      throw e;
    }
    const { lines } = sim.simulateJournal(scenario, { seed });
    const { simFeed } = await import('../../tui/feeds/sim-feed.ts');
    const { runLiveView } = await import('../../tui/run-view.tsx');
    const { createRunPipeline } = await import('../../pipeline/run-pipeline.ts');
    return runLiveView({
      feed: simFeed({ lines, scenarioName: scenario.name, speed, pace: (l, o) => paceLines(l, o) }),
      createPipeline: () => createRunPipeline(),
      ...processViewIo(io),
    });
  },
};
