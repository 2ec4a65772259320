// `halfswing record`: records a board unattended into an append-only journal, for hours or days.
import { isSimpleRig, rigJson } from '../../../protocol/rig.ts';
import { openJournalWriter, type JournalWriter } from '../../journal/journal-writer.ts';
import { runRecorder } from '../../session/recorder.ts';
import { statusLine, type RecorderStatus } from '../../session/recorder-status.ts';
import { writeStatusFile } from '../../journal/status-file.ts';
import { resolve } from 'node:path';
import { openDeviceLink, type DeviceLink } from '../../link/device-link.ts';
import { monotonicClock } from '../../link/monotonic-clock.ts';
import { holdSleepInhibitor } from '../../link/sleep-inhibitor.ts';
import { autosuspendWarning } from '../../link/usb-power.ts';
import { createRunPipeline } from '../../pipeline/run-pipeline.ts';
import { optNumber, optString, type Command, type CommandIo, type ParsedArgs } from '../command.ts';
import { guardOutputs } from '../../files/safe-output.ts';
import { UserError } from '../../errors.ts';
import { LINK_OPTIONS, linkSettings } from '../link-options.ts';
import { loadRigFile } from '../rig-file.ts';

const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

export const command: Command = {
  name: 'record',
  summary: 'record a board unattended into a journal, for hours or days',
  usage: 'record --rig FILE --journal FILE [--port P|auto] [options]',
  options: {
    port: { type: 'string', arg: 'P', description: "serial port, or 'auto' for the one board attached", default: 'auto' },
    rig: { type: 'string', arg: 'FILE', description: 'rig description (JSON), written into the journal' },
    journal: { type: 'string', arg: 'FILE', description: 'journal to append to (created if missing, never overwritten)' },
    status: { type: 'string', arg: 'FILE', description: 'also keep a JSON status file, rewritten atomically' },
    interval: { type: 'string', arg: 'S', description: 'seconds between status lines', default: '10' },
    quiet: { type: 'boolean', description: 'no status lines on stderr (warnings and errors still show)' },
    ...LINK_OPTIONS,
    flood: { type: 'string', arg: 'N', description: 'warn (and note in the journal) above N lines/s; 0: never', default: '500' },
    'stop-timeout': { type: 'string', arg: 'S', description: 'hard limit for a clean shutdown after a signal', default: '5' },
  },
  details: `
Stops cleanly on SIGINT, SIGTERM or SIGHUP: intake stops, the last line is finished, the journal is
fsynced and the port closed (exit 0). Needs no terminal: it never reads stdin, so it runs under a service
manager. A lost board (unplugged, a read error, silent for 3 heartbeats) is reconnected with backoff and
found again by its USB serial number; the journal records each disconnect and connect. A board reboot is
a new device segment in the same section. Running again with the same --journal appends a new section. See hardware-notes/unattended-runs.md for a systemd unit.`,
  async run(args, io) {
    const o = recordOptions(args, io);
    const rig = loadRigFile(o.rigPath, io.cwd, o.say);
    await guardStatusFile(o);
    // The journal is checked (writable, right format) before the port is touched.
    const writer = openJournalWriter(o.journalPath);
    const ac = new AbortController();
    const signals = stopOnSignals(ac, writer, o);

    const warnings: string[] = [];
    const inhibitor = await holdSleepInhibitor({ why: `recording ${o.journalArg}` });
    if (!inhibitor.held) warnings.push('no sleep inhibitor');
    o.say(`halfswing: ${inhibitor.note}`);

    const now = monotonicClock();
    const start = new Date();
    const link = openDeviceLink({ port: o.port, now, ...o.settings });
    announceReady(link, o, writer.appending, warnings);
    let summary;
    try {
      summary = await runRecorder({
        link,
        writer,
        header: { start, source: `halfswing 0.1.0 record --port ${o.port} (${o.settings.baud} baud)`, rigJson: rigJson(rig) },
        pipeline: createRunPipeline(isSimpleRig(rig) ? { rig } : {}),
        now,
        statusEveryMs: o.intervalS * 1000,
        onStatus: statusReporter(o),
        signal: ac.signal,
        stopReason: signals.why,
        warnings: () => warnings,
        floodLinesPerS: o.flood > 0 ? o.flood : Infinity,
      });
    } finally {
      signals.off();
      inhibitor.release();
      writer.close();
    }
    if (summary.error) throw summary.error;
    const s = summary.status;
    if (!o.quiet) o.say(`halfswing: stopped; ${s.lines} lines, ${s.passes} passes, ${s.reconnects} reconnects; ${o.journalArg} is ${s.journal_bytes} bytes`);
    return 0;
  },
};

type RecordOptions = ReturnType<typeof recordOptions>;

/** The command line, checked: one clear line for each missing or bad option. */
function recordOptions(args: ParsedArgs, io: CommandIo) {
  const rigPath = optString(args, 'rig');
  const journalArg = optString(args, 'journal');
  if (!rigPath) throw new UserError('record: --rig FILE is required (the rig description, see hardware-notes)', 2);
  if (!journalArg) throw new UserError('record: --journal FILE is required', 2);
  const statusArg = optString(args, 'status');
  return {
    rigPath,
    journalArg,
    journalPath: resolve(io.cwd, journalArg),
    statusPath: statusArg === undefined ? undefined : resolve(io.cwd, statusArg),
    port: optString(args, 'port') ?? 'auto',
    settings: linkSettings(args),
    intervalS: optNumber(args, 'interval', { min: 0.1, max: 86_400 })!,
    stopS: optNumber(args, 'stop-timeout', { min: 0.1, max: 600 })!,
    flood: optNumber(args, 'flood', { min: 0 })!,
    quiet: args.values.quiet === true,
    say: (line: string): void => void io.stderr.write(`${line}\n`),
    cwd: io.cwd,
  };
}

/** The status file is rewritten every interval: never onto the rig, the journal or any other journal (#14). */
async function guardStatusFile(o: RecordOptions): Promise<void> {
  if (o.statusPath === undefined) return;
  if (o.statusPath === o.journalPath) throw new UserError('record: --status and --journal name the same file; give each its own name', 2);
  await guardOutputs([{ path: o.statusPath, flag: '--status' }], [{ path: resolve(o.cwd, o.rigPath) }, { path: o.journalPath }]);
}

/** SIGINT, SIGTERM and SIGHUP abort the recording; a wedged port gets `--stop-timeout` seconds, then the process exits. */
function stopOnSignals(ac: AbortController, writer: JournalWriter, o: RecordOptions): { why: () => string; off: () => void } {
  let stopWhy = 'shutdown';
  const onSignal = (sig: string): void => {
    if (ac.signal.aborted) return;
    stopWhy = `shutdown (${sig})`;
    ac.abort();
    setTimeout(() => {
      try {
        writer.sync();
      } catch {
        // nothing more can be saved
      }
      o.say(`halfswing: shutdown took over ${o.stopS} s; the journal is synced up to its last line; exiting`);
      process.exit(1);
    }, o.stopS * 1000).unref();
  };
  for (const s of SIGNALS) process.on(s, onSignal);
  return { why: () => stopWhy, off: () => SIGNALS.forEach((s) => process.off(s, onSignal)) };
}

/** Says what is being recorded once the board's hello came, and warns when USB autosuspend may drop the board. */
function announceReady(link: DeviceLink, o: RecordOptions, appending: boolean, warnings: string[]): void {
  link.ready.then(
    (h) => {
      const path = link.path() ?? o.port;
      o.say(`halfswing: recording ${path} (fw ${h.fw}, ${h.hz} Hz, ${h.ch} channels) into ${o.journalArg}${appending ? ' (appending)' : ''}`);
      const w = autosuspendWarning(path);
      if (w) {
        warnings.push('USB autosuspend on');
        o.say(`halfswing: warning: ${w}`);
      }
    },
    () => {},
  );
}

/** Each status: a line on stderr (unless --quiet) and the --status file. */
function statusReporter(o: RecordOptions): (s: RecorderStatus) => void {
  return (s) => {
    if (!o.quiet) o.say(statusLine(s));
    if (!o.statusPath) return;
    try {
      writeStatusFile(o.statusPath, s);
    } catch (e) {
      o.say(`halfswing: warning: ${(e as Error).message}`);
    }
  };
}
