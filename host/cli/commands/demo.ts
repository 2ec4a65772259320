// Placeholder until the demo command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'demo',
  summary: 'not built yet',
  usage: 'demo',
  options: {},
  async run() {
    throw new UserError('demo is not built yet in this version', 1);
  },
};
