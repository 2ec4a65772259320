// End-to-end: `halfswing record` (a child process, stdin closed) on a real pty, with the simulator's device model on the far end.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { decodeLine } from '../../protocol/decode.ts';
import { loadScenario, parseScenario, simulateEntries, type Scenario } from '../../sim/index.ts';
import { PtyCable, ptyTestsEnabled } from './helpers/pty-device.ts';
import { journalDataLines, journalEntries, journalText, startRecorder, waitFor, type RecorderChild } from './helpers/recorder-process.ts';
import { SimBoard } from './helpers/sim-board.ts';

const enabled = ptyTestsEnabled();

let dir: string;
let cables: PtyCable[] = [];
let children: RecorderChild[] = [];
beforeEach(() => {
  dir = mkdtempSync(join(tmpdir(), 'halfswing-rec-'));
});
afterEach(async () => {
  for (const c of children) if (c.proc.exitCode === null) c.proc.kill('SIGKILL');
  for (const c of cables) await c.kill();
  cables = [];
  children = [];
  rmSync(dir, { recursive: true, force: true });
});

const BRASS = loadScenario('brass-1m-two-hours');
const SIM = { seed: 7, durationS: 300, no_faults: true } as const;

/** Writes the scenario's rig to a file, as a user would. */
function rigFile(sc: Scenario): string {
  const rigLine = simulateEntries(sc, SIM).header.find((l) => l.startsWith('#rig '))!;
  const p = join(dir, 'rig.json');
  writeFileSync(p, rigLine.slice(5));
  return p;
}

async function plug(path: string): Promise<PtyCable> {
  const c = await PtyCable.plug(path);
  cables.push(c);
  return c;
}

function record(args: string[]): RecorderChild {
  // The board runs at up to 150× real time here: far above the flood warning meant for real rigs.
  const c = startRecorder(['--interval', '0.5', '--hello-timeout', '4', '--flood', '0', ...args]);
  children.push(c);
  return c;
}

/** Resolves at the recorder's first command: its port is open (and flushed), so the board can start. */
function firstCommand(cable: PtyCable): Promise<string> {
  return new Promise((r) => cable.onCommand(r));
}

const data = (es: JournalEntry[]): string[] => es.flatMap((e) => (e.kind === 'data' ? [e.line] : []));
const words = (es: JournalEntry[]): string[] => es.flatMap((e) => (e.kind === 'annotation' ? [e.word] : []));

/** The analysis with the nominal device clock, so host arrival times (pty vs simulated USB) do not enter. */
const analyze = (es: JournalEntry[]) => analyzeEntries(es, { clock: 'nominal' });

describe.skipIf(!enabled)('record over a pty', () => {
  it('a full run: every line the board sent is journaled in order, and g agrees with the simulator truth', async () => {
    const port = join(dir, 'ttyBOARD');
    const journal = join(dir, 'run.journal');
    const status = join(dir, 'status.json');
    const cable = await plug(port);
    const rec = record(['--port', port, '--rig', rigFile(BRASS), '--journal', journal, '--status', status]);
    await firstCommand(cable);
    const board = new SimBoard(BRASS, SIM, 150);
    board.attach(cable);
    await board.run();
    await waitFor(() => journalDataLines(journal).length >= board.sent.length, 'all lines journaled');
    rec.proc.kill('SIGTERM');
    expect(await rec.exited).toBe(0);
    const es = await journalEntries(journal);
    expect(data(es)).toEqual(board.sent);
    expect(words(es)).toEqual(['connect', 'disconnect']);
    expect(es.find((e) => e.kind === 'annotation' && e.word === 'disconnect')).toMatchObject({ text: 'shutdown (SIGTERM)' });
    // host_us never decreases within the section (JOURNAL.md, data lines).
    const us = es.flatMap((e) => (e.kind === 'data' || e.kind === 'annotation' ? [e.hostUs] : []));
    expect(us).toEqual([...us].sort((a, b) => a - b));
    const r = analyze(es);
    const truthG = BRASS.physics.g_m_s2;
    expect(r.g_m_s2).not.toBeNull();
    expect(Math.abs(r.g_m_s2! - truthG)).toBeLessThan(3 * r.g_u_m_s2!);
    expect(r.counts).toMatchObject({ crc_errors: 0, bad_lines: 0, lines_lost: 0, reboots: 0 });
    // The status file is whole JSON and says the run stopped.
    const st = JSON.parse(readFileSync(status, 'utf8'));
    expect(st).toMatchObject({ state: 'stopped', lines: board.sent.length, line_errors: 0, reconnects: 0 });
    expect(st.passes).toBeGreaterThan(100);
    expect(rec.stderr()).toMatch(/passes \d+ {2}T 2\.\d{5} s/);
  });
});
