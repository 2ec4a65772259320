// Placeholder until the analyze command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'analyze',
  summary: 'not built yet',
  usage: 'analyze',
  options: {},
  async run() {
    throw new UserError('analyze is not built yet in this version', 1);
  },
};
