// The serial-link options that `record`, `live` and `probe` share, with one parser.
import { DEFAULT_BAUD } from '../../protocol/link-defaults.ts';
import { optNumber, type OptionSpec, type ParsedArgs } from './command.ts';

export const LINK_OPTIONS = {
  baud: { type: 'string', arg: 'N', description: 'serial speed; must match the firmware', default: String(DEFAULT_BAUD) },
  'hello-timeout': { type: 'string', arg: 'S', description: 'seconds to wait for the board to say hello', default: '5' },
  'keep-dtr': { type: 'boolean', description: 'leave DTR up when the port closes, so a re-open does not reset the board' },
} as const satisfies Record<string, OptionSpec>;

/** The device-link settings of LINK_OPTIONS; throws UserError (exit 2) for a bad value. */
export function linkSettings(args: ParsedArgs): { baud: number; helloTimeoutMs: number; hupcl?: false } {
  return {
    baud: optNumber(args, 'baud', { min: 300, max: 4_000_000, integer: true })!,
    helloTimeoutMs: optNumber(args, 'hello-timeout', { min: 0.1, max: 600 })! * 1000,
    ...(args.values['keep-dtr'] ? { hupcl: false as const } : {}),
  };
}
