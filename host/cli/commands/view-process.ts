// The process-level pieces the live view needs (clock, timers, signals), handed in by the view commands.
import type { CommandIo } from '../command.ts';
import type { RunViewOptions } from '../../tui/run-view.tsx';
import { createResultSource } from '../../pipeline/result-client.ts';

/**
 * Streams from the command's io; wall clock, timers and SIGINT/SIGTERM/SIGHUP from this process; the full
 * result in a worker thread. The worker's pipeline takes the rig from the entries' `#rig` line, which every
 * view feed carries (live writes the given rig there).
 */
export function processViewIo(io: CommandIo): Pick<RunViewOptions, 'stdout' | 'stderr' | 'stdin' | 'nowMs' | 'timers' | 'onSignal' | 'createResults'> {
  return {
    createResults: (warn) => createResultSource({}, warn),
    stdout: io.stdout,
    stderr: io.stderr,
    stdin: io.stdin,
    nowMs: () => performance.now(),
    timers: {
      setInterval: (fn, ms) => setInterval(fn, ms),
      clearInterval: (h) => clearInterval(h as NodeJS.Timeout),
      setTimeout: (fn, ms) => setTimeout(fn, ms),
      clearTimeout: (h) => clearTimeout(h as NodeJS.Timeout),
    },
    onSignal(handler) {
      const sigs = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;
      const fns = sigs.map((s) => {
        const fn = (): void => handler(s);
        process.on(s, fn);
        return [s, fn] as const;
      });
      return () => fns.forEach(([s, fn]) => process.off(s, fn));
    },
  };
}
