// Placeholder until the record command lands.
import type { Command } from '../command.ts';
import { UserError } from '../errors.ts';

export const command: Command = {
  name: 'record',
  summary: 'not built yet',
  usage: 'record',
  options: {},
  async run() {
    throw new UserError('record is not built yet in this version', 1);
  },
};
