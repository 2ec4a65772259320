// The contract every CLI command implements, and the shared option parser that gives each one --help.
import { parseArgs } from 'node:util';
import { UserError } from '../errors.ts';

/** One option of a command, as shown in its help and parsed by node:util parseArgs. */
export interface OptionSpec {
  readonly type: 'string' | 'boolean';
  readonly short?: string;
  /** Placeholder shown in help, e.g. FILE. */
  readonly arg?: string;
  readonly description: string;
  readonly default?: string | boolean;
  readonly multiple?: boolean;
}

/** Streams and process facts a command may use; injected so commands can be tested. */
export interface CommandIo {
  readonly stdout: NodeJS.WritableStream & { isTTY?: boolean; columns?: number; rows?: number };
  readonly stderr: NodeJS.WritableStream & { isTTY?: boolean };
  readonly stdin: NodeJS.ReadableStream & { isTTY?: boolean };
  readonly env: NodeJS.ProcessEnv;
  readonly cwd: string;
}

export interface ParsedArgs {
  readonly values: Record<string, string | boolean | string[] | undefined>;
  readonly positionals: string[];
}

/** A CLI command: its help text comes from `summary`, `usage`, `options` and `details`. */
export interface Command {
  readonly name: string;
  readonly summary: string;
  /** Usage line after `halfswing `, e.g. `analyze JOURNAL [options]`. */
  readonly usage: string;
  readonly options: Readonly<Record<string, OptionSpec>>;
  /** Paragraphs shown after the options. */
  readonly details?: string;
  /** Positional arguments: [min, max]. */
  readonly positionals?: readonly [number, number];
  /** Runs the command; resolves to the process exit code. Throw UserError for expected failures. */
  run(args: ParsedArgs, io: CommandIo): Promise<number>;
}

/** The help text of a command. */
export function commandHelp(cmd: Command): string {
  const rows = Object.entries(cmd.options).map(([name, o]) => {
    const flag = `${o.short ? `-${o.short}, ` : '    '}--${name}${o.type === 'string' ? ` ${o.arg ?? 'VALUE'}` : ''}`;
    const def = o.default !== undefined && o.default !== false ? ` (default: ${String(o.default)})` : '';
    return [flag, `${o.description}${def}`] as const;
  });
  rows.push(['-h, --help', 'show this help']);
  const w = Math.max(...rows.map(([f]) => f.length)) + 2;
  const opts = rows.map(([f, d]) => `  ${f.padEnd(w)}${d}`).join('\n');
  return `halfswing ${cmd.name}: ${cmd.summary}\n\nUsage: halfswing ${cmd.usage}\n\nOptions:\n${opts}\n${cmd.details ? `\n${cmd.details.trim()}\n` : ''}`;
}

/** Parses argv for a command; throws UserError (exit 2) with a one-line message on bad usage. */
export function parseCommandArgs(cmd: Command, argv: readonly string[]): ParsedArgs | 'help' {
  if (argv.includes('--help') || argv.includes('-h')) return 'help';
  const options: Record<string, { type: 'string' | 'boolean'; short?: string; multiple?: boolean; default?: string | boolean }> = {};
  for (const [name, o] of Object.entries(cmd.options)) {
    options[name] = { type: o.type, ...(o.short ? { short: o.short } : {}), ...(o.multiple ? { multiple: true } : {}), ...(o.default !== undefined ? { default: o.default } : {}) };
  }
  let parsed: ParsedArgs;
  try {
    const r = parseArgs({ args: joinNegativeValues(cmd, argv), options, allowPositionals: true, strict: true });
    parsed = { values: r.values as ParsedArgs['values'], positionals: r.positionals };
  } catch (e) {
    const msg = (e as Error).message.split('\n')[0]!.replace(/\. To specify a positional.*$/, '');
    throw new UserError(`${cmd.name}: ${msg} (see halfswing ${cmd.name} --help)`, 2);
  }
  const [min, max] = cmd.positionals ?? [0, 0];
  if (parsed.positionals.length < min) throw new UserError(`${cmd.name}: missing argument (usage: halfswing ${cmd.usage})`, 2);
  if (parsed.positionals.length > max)
    throw new UserError(`${cmd.name}: unexpected argument '${parsed.positionals[max]}' (usage: halfswing ${cmd.usage})`, 2);
  return parsed;
}

/**
 * `--ppm -200` and `--duration -5`: a value that looks like a negative number is the option's value, not an
 * option (parseArgs would call it ambiguous); such pairs are passed on as `--ppm=-200`.
 */
function joinNegativeValues(cmd: Command, argv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    const next = argv[i + 1];
    const name = a.startsWith('--') ? a.slice(2) : a.length === 2 && a[0] === '-' ? Object.keys(cmd.options).find((k) => cmd.options[k]!.short === a[1]) : undefined;
    if (a === '--') {
      out.push(...argv.slice(i));
      break;
    }
    if (name !== undefined && cmd.options[name]?.type === 'string' && next !== undefined && /^-(\d|\.\d)/.test(next)) {
      out.push(`--${name}=${next}`);
      i++;
    } else out.push(a);
  }
  return out;
}

/** Reads a string option, or undefined. */
export function optString(args: ParsedArgs, name: string): string | undefined {
  const v = args.values[name];
  return typeof v === 'string' ? v : undefined;
}

/** Reads a numeric option with range checking; throws UserError naming the option. */
export function optNumber(args: ParsedArgs, name: string, opts: { min?: number; max?: number; integer?: boolean } = {}): number | undefined {
  const s = optString(args, name);
  if (s === undefined) return undefined;
  const v = Number(s);
  const bad =
    s.trim() === '' ||
    !Number.isFinite(v) ||
    (opts.integer && !Number.isInteger(v)) ||
    (opts.min !== undefined && v < opts.min) ||
    (opts.max !== undefined && v > opts.max);
  if (bad) {
    const range = [opts.min !== undefined ? `≥ ${opts.min}` : '', opts.max !== undefined ? `≤ ${opts.max}` : ''].filter(Boolean).join(' and ');
    throw new UserError(`--${name} must be ${opts.integer ? 'an integer' : 'a number'}${range ? ` ${range}` : ''}, not '${s}'`, 2);
  }
  return v;
}
