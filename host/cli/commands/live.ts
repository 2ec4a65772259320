// Placeholder until the live command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'live',
  summary: 'not built yet',
  usage: 'live',
  options: {},
  async run() {
    throw new UserError('live is not built yet in this version', 1);
  },
};
