// Placeholder until the watch command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'watch',
  summary: 'not built yet',
  usage: 'watch',
  options: {},
  async run() {
    throw new UserError('watch is not built yet in this version', 1);
  },
};
