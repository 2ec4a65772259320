// `halfswing record`: records a board unattended into an append-only journal, for hours or days.
import { isSimpleRig, rigJson } from '../../../protocol/rig.ts';
import { openJournalWriter } from '../../journal/journal-writer.ts';
import { runRecorder } from '../../session/recorder.ts';
import { statusLine, type RecorderStatus } from '../../session/recorder-status.ts';
import { writeStatusFile } from '../../journal/status-file.ts';
import { resolve } from 'node:path';
import { openDeviceLink } from '../../link/device-link.ts';
import { monotonicClock } from '../../link/monotonic-clock.ts';
import { holdSleepInhibitor } from '../../link/sleep-inhibitor.ts';
import { autosuspendWarning } from '../../link/usb-power.ts';
import { createRunPipeline } from '../../pipeline/run-pipeline.ts';
import { optNumber, optString, type Command } from '../command.ts';
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
    const rigPath = optString(args, 'rig');
    const journalPath = optString(args, 'journal');
    if (!rigPath) throw new UserError('record: --rig FILE is required (the rig description, see hardware-notes)', 2);
    if (!journalPath) throw new UserError('record: --journal FILE is required', 2);
    const port = optString(args, 'port') ?? 'auto';
    const settings = linkSettings(args);
    const intervalS = optNumber(args, 'interval', { min: 0.1, max: 86_400 })!;
    const stopS = optNumber(args, 'stop-timeout', { min: 0.1, max: 600 })!;
    const flood = optNumber(args, 'flood', { min: 0 })!;
    const statusPath = optString(args, 'status');
    const quiet = args.values.quiet === true;
    const say = (line: string): void => void io.stderr.write(`${line}\n`);
    const rig = loadRigFile(rigPath, io.cwd, say);
    // The journal is checked (writable, right format) before the port is touched.
    const writer = openJournalWriter(resolve(io.cwd, journalPath));

    const ac = new AbortController();
    let stopWhy = 'shutdown';
    const onSignal = (sig: string): void => {
      if (ac.signal.aborted) return;
      stopWhy = `shutdown (${sig})`;
      ac.abort();
      // A wedged port must not keep the process: sync what is there and leave.
      setTimeout(() => {
        try {
          writer.sync();
        } catch {
          // nothing more can be saved
        }
        say(`halfswing: shutdown took over ${stopS} s; the journal is synced up to its last line; exiting`);
        process.exit(1);
      }, stopS * 1000).unref();
    };
    for (const s of SIGNALS) process.on(s, onSignal);

    const warnings: string[] = [];
    const inhibitor = await holdSleepInhibitor({ why: `recording ${journalPath}` });
    if (!inhibitor.held) warnings.push('no sleep inhibitor');
    say(`halfswing: ${inhibitor.note}`);

    const now = monotonicClock();
    const start = new Date();
    const link = openDeviceLink({ port, now, ...settings });
    link.ready.then(
      (h) => {
        const path = link.path() ?? port;
        say(`halfswing: recording ${path} (fw ${h.fw}, ${h.hz} Hz, ${h.ch} channels) into ${journalPath}${writer.appending ? ' (appending)' : ''}`);
        const w = autosuspendWarning(path);
        if (w) {
          warnings.push('USB autosuspend on');
          say(`halfswing: warning: ${w}`);
        }
      },
      () => {},
    );
    const onStatus = (s: RecorderStatus): void => {
      if (!quiet) say(statusLine(s));
      if (statusPath) {
        try {
          writeStatusFile(statusPath, s);
        } catch (e) {
          say(`halfswing: warning: ${(e as Error).message}`);
        }
      }
    };
    let summary;
    try {
      summary = await runRecorder({
        link,
        writer,
        header: { start, source: `halfswing 0.1.0 record --port ${port} (${settings.baud} baud)`, rigJson: rigJson(rig) },
        pipeline: createRunPipeline(isSimpleRig(rig) ? { rig } : {}),
        now,
        statusEveryMs: intervalS * 1000,
        onStatus,
        signal: ac.signal,
        stopReason: () => stopWhy,
        warnings: () => warnings,
        floodLinesPerS: flood > 0 ? flood : Infinity,
      });
    } finally {
      for (const s of SIGNALS) process.off(s, onSignal);
      inhibitor.release();
      writer.close();
    }
    if (summary.error) throw summary.error;
    const s = summary.status;
    if (!quiet) say(`halfswing: stopped; ${s.lines} lines, ${s.passes} passes, ${s.reconnects} reconnects; ${journalPath} is ${s.journal_bytes} bytes`);
    return 0;
  },
};
