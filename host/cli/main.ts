// CLI entry: dispatches `halfswing <command>` and turns expected failures into one line and an exit code.
import { COMMANDS } from './registry.ts';
import { commandHelp, parseCommandArgs, type CommandIo } from './command.ts';
import { isUserError } from '../errors.ts';

function topHelp(): string {
  const w = Math.max(...COMMANDS.map((c) => c.name.length)) + 2;
  const rows = COMMANDS.map((c) => `  ${c.name.padEnd(w)}${c.summary}`).join('\n');
  return `halfswing: photogate timing of a swinging pendulum (firmware host companion)\n\nUsage: halfswing <command> [options]\n\nCommands:\n${rows}\n\nRun 'halfswing <command> --help' for a command's options.\n`;
}

/** Runs the CLI with the given arguments and streams; resolves to the exit code. */
export async function runCli(argv: readonly string[], io: CommandIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    io.stdout.write(topHelp());
    return name === undefined ? 2 : 0;
  }
  if (name === '--version') {
    io.stdout.write('halfswing 0.1.0\n');
    return 0;
  }
  const entry = COMMANDS.find((c) => c.name === name);
  if (!entry) {
    io.stderr.write(`halfswing: unknown command '${name}' (run 'halfswing --help' for the list)\n`);
    return 2;
  }
  quietOnClosedPipe(io);
  try {
    const cmd = await entry.load();
    const parsed = parseCommandArgs(cmd, rest);
    if (parsed === 'help') {
      io.stdout.write(commandHelp(cmd));
      return 0;
    }
    return await cmd.run(parsed, io);
  } catch (e) {
    if (isUserError(e)) {
      io.stderr.write(`halfswing: ${e.message}\n`);
      return e.exitCode;
    }
    throw e;
  }
}

/**
 * A reader that goes away (`halfswing analyze --json | head -c 50`) makes the next write fail with EPIPE: that
 * ends the output, not the program with a stack trace. Other stream errors become one line.
 */
function quietOnClosedPipe(io: CommandIo): void {
  const onError = (e: NodeJS.ErrnoException): void => {
    if (e.code === 'EPIPE') return;
    try {
      io.stderr.write(`halfswing: cannot write output (${e.code ?? e.message})\n`);
    } catch {
      // stderr is gone too: nothing left to tell.
    }
    process.exitCode = 1;
  };
  io.stdout.on('error', onError);
}
