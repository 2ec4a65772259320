// `halfswing record` (a child process, no stdin) on a real pty with the simulator's device model on the far end:
// a full run, then a cable pulled and replugged, a board reboot, garbage, a stalled reader, SIGKILL.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { followJournal } from '../../host/journal/follow-journal.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { decodeLine } from '../../protocol/decode.ts';
import type { JournalEntry } from '../../protocol/journal.ts';
import { parseScenario, type Scenario } from '../../sim/index.ts';
import { ptyTestsEnabled } from './helpers/pty-device.ts';
import { firstCommand, usePtyFixture } from './helpers/pty-fixture.ts';
import { journalDataLines, journalEntries, journalText, waitFor } from './helpers/recorder-process.ts';
import { SimBoard } from './helpers/sim-board.ts';

const enabled = ptyTestsEnabled();

const RAW = JSON.parse(readFileSync(fileURLToPath(new URL('../../sim/scenarios/brass-1m-two-hours.json', import.meta.url)), 'utf8'));
const CLEAN: Scenario = parseScenario({ ...RAW, faults: {} });
const SIM = { seed: 11, durationS: 300 } as const;

// The board runs at up to 150× real time here: far above the flood warning meant for real rigs.
const fx = usePtyFixture('halfswing-rec-', ['--interval', '0.5', '--hello-timeout', '4', '--flood', '0']);

const data = (es: JournalEntry[]): string[] => es.flatMap((e) => (e.kind === 'data' ? [e.line] : []));
const words = (es: JournalEntry[]): string[] => es.flatMap((e) => (e.kind === 'annotation' ? [e.word] : []));
const analyze = (es: JournalEntry[]) => analyzeEntries(es, { clock: 'nominal' });

/** Starts a recorder on a fresh pty and the board behind it; the board runs in the background. */
async function rig(sc: Scenario, speed: number, extra: string[] = []) {
  const cable = await fx.plug();
  const port = cable.path;
  const journal = join(fx.dir(), 'run.journal');
  const rec = fx.record(['--port', port, '--rig', fx.rigFile(sc, SIM), '--journal', journal, ...extra]);
  await firstCommand(cable);
  const board = new SimBoard(sc, SIM, speed);
  board.attach(cable);
  return { port, journal, cable, rec, board };
}

const withinThreeSigma = (r: { g_m_s2: number | null; g_u_m_s2: number | null }, g: number): void => {
  expect(r.g_m_s2).not.toBeNull();
  expect(Math.abs(r.g_m_s2! - g)).toBeLessThan(3 * r.g_u_m_s2!);
};

describe.skipIf(!enabled)('record over a pty', () => {
  it('a full run: every line the board sent is journaled in order, and g agrees with the simulator truth', async () => {
    const status = join(fx.dir(), 'status.json');
    const { journal, rec, board } = await rig(CLEAN, 150, ['--status', status]);
    // A viewer follows the journal while it is written (what `halfswing watch` does).
    const ac = new AbortController();
    const followed: JournalEntry[] = [];
    const following = (async () => {
      for await (const e of followJournal(journal, { waitForFile: true, pollMs: 10, signal: ac.signal })) followed.push(e);
    })();
    await board.run();
    await waitFor(() => journalDataLines(journal).length === board.sent.length, 'all lines journaled');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    expect(data(es)).toEqual(board.sent);
    await waitFor(() => followed.length === es.length, 'the follower to catch up');
    ac.abort();
    await following;
    expect(followed).toEqual(es);
    // A clean SIGTERM stop is a stop, not a disconnect (#14 item 11), and is not counted as one.
    expect(words(es)).toEqual(['connect', 'stop']);
    expect(es.find((e) => e.kind === 'annotation' && e.word === 'stop')).toMatchObject({ text: 'shutdown (SIGTERM)' });
    // host_us never decreases within the section (JOURNAL.md, data lines).
    const us = es.flatMap((e) => (e.kind === 'data' || e.kind === 'annotation' ? [e.hostUs] : []));
    expect(us).toEqual([...us].sort((a, b) => a - b));
    const r = analyze(es);
    withinThreeSigma(r, CLEAN.physics.g_m_s2);
    expect(r.counts).toMatchObject({ crc_errors: 0, bad_lines: 0, lines_lost: 0, reboots: 0, disconnects: 0 });
    // The status file is whole JSON and says the run stopped.
    const st = JSON.parse(readFileSync(status, 'utf8'));
    expect(st).toMatchObject({ state: 'stopped', lines: board.sent.length, line_errors: 0, reconnects: 0 });
    expect(st.passes).toBeGreaterThan(100);
    expect(rec.stderr()).toMatch(/passes \d+ {2}T 2\.\d{5} s/);
  });

  it('cable pulled mid-run and plugged back: one disconnect, one connect, every line before and after journaled, g still right', async () => {
    const { port, journal, rec, board } = await rig(CLEAN, 150);
    // Each stretch ends at a board time, so the story is the same however loaded the machine is.
    await board.run(120);
    await waitFor(() => journalDataLines(journal).length === board.sent.length, 'lines before the pull');
    const before = board.sent.length;
    board.detach();
    await fx.cables()[0]!.kill();
    // The board keeps swinging and sending for 20 s while the cable is out; those lines are lost.
    await board.run(140);
    await waitFor(() => journalText(journal).includes(' disconnect '), 'the recorder saw the loss');
    const cable2 = await fx.plug();
    board.attach(cable2);
    // The recorder reopens the port and asks '?'; the board answers when it runs on.
    await waitFor(() => board.commands > 0, 'the recorder back on the port');
    await board.run();
    await waitFor(() => journalDataLines(journal).length === board.sent.length, 'lines after the replug');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    expect(words(es)).toEqual(['connect', 'disconnect', 'connect', 'stop']);
    expect(data(es)).toEqual(board.sent);
    expect(board.sent.length).toBeGreaterThan(before + 100);
    const r = analyze(es);
    expect(r.counts.lines_lost).toBe(board.dropped);
    expect(r.counts.reboots).toBe(0);
    withinThreeSigma(r, CLEAN.physics.g_m_s2);
    expect(rec.stderr()).toMatch(/reconnects 1/);
  });

  it('a board reboot mid-run is a new device segment in the same journal section', async () => {
    const sc = parseScenario({ ...RAW, faults: { reboot: { at_s: [150], cause: 'watchdog' } } });
    const { journal, rec, board } = await rig(sc, 150);
    await board.run();
    await waitFor(() => journalDataLines(journal).length === board.sent.length, 'all lines');
    rec.proc.kill('SIGINT');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    expect(data(es)).toEqual(board.sent);
    expect(es.filter((e) => e.kind === 'start')).toHaveLength(1);
    const boots = new Set(data(es).flatMap((l) => (l.startsWith('H ') ? [/boot=([0-9a-f]{4})/.exec(l)![1]] : [])));
    expect(boots.size).toBe(2);
    expect(words(es)).toEqual(['connect', 'stop']);
    const r = analyze(es);
    expect(r.counts.reboots).toBe(1);
    withinThreeSigma(r, sc.physics.g_m_s2);
  });

  it('garbage on the line is journaled and counted, never merged with good lines, and good lines all arrive', async () => {
    const junk = ['\xff\xfe\x00 noise\n', `${'x'.repeat(200)}\n`, 'E 1 0 f 3d *00\r\n', '\x1b[2J\n', `${'\x80'.repeat(500)}\n`];
    const { journal, rec, board } = await rig(CLEAN, 150);
    let injected = 0;
    await board.run(Infinity, (i) => (i > 0 && i % 40 === 0 ? (injected++, Buffer.from(junk[injected % junk.length]!, 'latin1')) : undefined));
    await waitFor(() => journalDataLines(journal).length === board.sent.length + injected, 'all lines');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    const lines = data(es);
    expect(lines.filter((l) => decodeLine(l).ok)).toEqual(board.sent);
    expect(lines.filter((l) => !decodeLine(l).ok)).toHaveLength(injected);
    // Over-long junk is cut to the protocol's 80 bytes (SPEC section 6), never held whole.
    expect(Math.max(...lines.map((l) => l.length))).toBeLessThanOrEqual(80);
    const r = analyze(es);
    expect(r.counts.crc_errors + r.counts.bad_lines).toBe(injected);
    withinThreeSigma(r, CLEAN.physics.g_m_s2);
  });

  it('a reader that stalls (SIGSTOP) while the board sends at full speed loses no line', async () => {
    const { journal, cable, rec, board } = await rig(CLEAN, Infinity);
    board.pause();
    rec.proc.kill('SIGSTOP');
    board.resume();
    // The pty and pipe fill up, then the board is held back by the pty: flow control, not loss.
    // Stopped until the pty holds the board back, or until the board has sent the whole run into the buffers.
    const held = cable.whenHeldBack();
    const running = board.run();
    await Promise.race([held, running]);
    rec.proc.kill('SIGCONT');
    await running;
    await waitFor(() => journalDataLines(journal).length === board.sent.length, 'all lines after the stall');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    expect(data(es)).toEqual(board.sent);
    expect(analyze(es).counts.lines_lost).toBe(0);
  });

  it('SIGKILL mid-run leaves a journal of whole lines (at most a cut last one) that replays to the numbers of the lines it holds; a re-run appends', async () => {
    const { port, journal, rec, board } = await rig(CLEAN, 150);
    // Killed while the board is sending, at some point between 200 s and 250 s of board time.
    const running = board.run(250);
    await waitFor(() => board.now >= 200, 'board at 200 s');
    rec.proc.kill('SIGKILL');
    await rec.exited;
    board.pause();
    const es = await journalEntries(journal);
    const lines = data(es);
    // Every journaled line is the board's line at the same position; only the last may be cut short.
    lines.forEach((l, i) => (i < lines.length - 1 ? expect(l).toBe(board.sent[i]) : expect(board.sent[i]!.startsWith(l)).toBe(true)));
    expect(lines.length).toBeGreaterThan(100);
    // The same lines analysed from the board's own record of them give the same numbers.
    const whole = lines.filter((l, i) => l === board.sent[i]);
    const reference: JournalEntry[] = [
      ...es.filter((e) => e.kind !== 'data' && e.kind !== 'annotation'),
      ...whole.map((line, i) => ({ kind: 'data' as const, hostUs: i * 1000, line: board.sent[i]! })),
    ];
    const a = analyze(es);
    const b = analyze(reference);
    expect(a.passes).toBe(b.passes);
    expect(a.T0_s).toBe(b.T0_s);
    expect(a.g_m_s2).toBe(b.g_m_s2);
    // Recording again on the same journal appends a new section after the cut. (socat ends when the dead
    // recorder's side of the pty closes, so the board gets a new cable, as after a host reboot.)
    await fx.cables()[0]!.kill();
    const cable2 = await fx.plug();
    const rec2 = fx.record(['--port', port, '--rig', join(fx.dir(), 'rig.json'), '--journal', journal]);
    const ask = await firstCommand(cable2);
    board.attach(cable2);
    // The board answers the '?' that told us the new recorder is listening.
    board.device.command(board.now, ask);
    board.resume();
    await running;
    await board.run();
    // The board said hello long ago: the new recorder's '?' gets a fresh one.
    await waitFor(() => journalText(journal).split('#start').length === 3, 'second section');
    rec2.proc.kill('SIGTERM');
    expect(await rec2.exited).toBe(0);
    const after = await journalEntries(journal);
    expect(after.filter((e) => e.kind === 'magic')).toHaveLength(1);
    expect(after.filter((e) => e.kind === 'start')).toHaveLength(2);
    expect(after.filter((e) => e.kind === 'malformed')).toHaveLength(0);
  });
});
