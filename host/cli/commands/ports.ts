// Placeholder until the ports command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'ports',
  summary: 'not built yet',
  usage: 'ports',
  options: {},
  async run() {
    throw new UserError('ports is not built yet in this version', 1);
  },
};
