// The shipped firmware behind a pseudo-terminal (`sim --firmware --pty`): `record` journals every line the
// firmware sent, and `probe` finds the board healthy. socat and the AVR toolchain are required under CI.
import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import type { JournalEntry } from '../../protocol/journal.ts';
import { serveFirmwarePty } from '../../sim/emulator/firmware-pty.ts';
import { loadScenario, parseScenario } from '../../sim/index.ts';
import type { PtyOptions } from '../../sim/outlets/pty.ts';
import { ptyTestsEnabled } from '../recorder/helpers/pty-device.ts';
import { usePtyFixture } from '../recorder/helpers/pty-fixture.ts';
import { journalDataLines, journalEntries, waitFor } from '../recorder/helpers/recorder-process.ts';
import { describeFirmware } from './toolchain-gate.ts';

const BIN = fileURLToPath(new URL('../../bin/halfswing.js', import.meta.url));
const enabled = ptyTestsEnabled();
const fx = usePtyFixture('halfswing-fw-pty-', ['--hello-timeout', '4']);

/** Serves the firmware on a pty; resolves once the host path is known. */
async function serve(opts: Omit<PtyOptions, 'onReady'>, sc = loadScenario('demo-low-q')) {
  let ready: (p: string) => void = () => undefined;
  const path = new Promise<string>((r) => (ready = r));
  const served = serveFirmwarePty(sc, { ...opts, onReady: ready });
  return { path: await path, served };
}

(enabled ? describeFirmware : describe.skip)('the shipped firmware on a pty', () => {
  it('record over it for a minute of device time (at 2× real time): every line the firmware sent is in the journal, in order', async () => {
    const sim = { seed: 5, durationS: 60 };
    const sc = loadScenario('demo-low-q');
    const sent: string[] = [];
    const ac = new AbortController();
    // The run's clock starts at the recorder's first '?', so no line goes out before the port is open.
    const { path, served } = await serve({ ...sim, speed: 2, startOnCommand: true, signal: ac.signal, onSent: (l) => sent.push(l) }, sc);
    const journal = join(fx.dir(), 'run.journal');
    const rec = fx.record(['--port', path, '--rig', fx.rigFile(sc, sim), '--journal', journal]);
    const truth = await served;
    expect(truth.complete).toBe(true);
    await waitFor(() => journalDataLines(journal).length >= sent.length, 'every line journaled');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    const data = es.flatMap((e: JournalEntry) => (e.kind === 'data' ? [e.line] : []));
    expect(data).toEqual(sent);
    // A minute at 1 s heartbeats, the firmware's hello first, and the swing's edges.
    expect(sent[0]).toMatch(/^H 0 halfswing proto=1 fw=\S+ mcu=m328p hz=16000000 ch=2 boot=[0-9a-f]{4} rc=1 \*[0-9a-f]{2}$/);
    expect(sent.filter((l) => l.startsWith('T ')).length).toBeGreaterThanOrEqual(58);
    expect(sent.filter((l) => l.startsWith('E ')).length).toBeGreaterThan(60);
    const r = analyzeEntries(es);
    expect(r.counts).toMatchObject({ crc_errors: 0, bad_lines: 0, lines_lost: 0, reboots: 0 });
  }, 120_000);

  it('probe finds it healthy: hello, the reply to ?, regular heartbeats, no line errors', async () => {
    const sc = parseScenario({ ...loadScenario('ideal-60deg'), faults: {} });
    const ac = new AbortController();
    const { path, served } = await serve({ seed: 3, durationS: 30, speed: 1, startOnCommand: true, signal: ac.signal }, sc);
    const child = spawn(process.execPath, [BIN, 'probe', '--port', path, '--seconds', '3.5'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (err += d.toString()));
    const [code] = await once(child, 'exit');
    ac.abort();
    await served;
    expect(err, out).toBe('');
    expect(out).toMatch(/^firmware   halfswing \S+ on m328p, protocol 1, boot [0-9a-f]{4}$/m);
    expect(out).toMatch(/^'\?' reply  \d+\.\d ms$/m);
    expect(out).toMatch(/^heartbeats \d+ in 3.5 s: every \d+\.\d ms .*expected 1000$/m);
    expect(out).toMatch(/^lines      \d+, rejected 0 \(0\.00 %\), missing 0$/m);
    expect(out).toMatch(/^verdict    looks healthy$/m);
    expect(code).toBe(0);
  }, 60_000);
});
