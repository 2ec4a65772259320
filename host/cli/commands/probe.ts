// Placeholder until the probe command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'probe',
  summary: 'not built yet',
  usage: 'probe',
  options: {},
  async run() {
    throw new UserError('probe is not built yet in this version', 1);
  },
};
