// Placeholder until the sim command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'sim',
  summary: 'not built yet',
  usage: 'sim',
  options: {},
  async run() {
    throw new UserError('sim is not built yet in this version', 1);
  },
};
