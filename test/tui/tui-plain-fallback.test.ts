// Without a terminal (a pipe, CI, a service): no raw mode, no escape codes, plain status lines, and the same numbers as analyze.
import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { simFeed } from '../../host/tui/feeds/sim-feed.ts';
import { runLiveView } from '../../host/tui/run-view.tsx';
import { formatWithU } from '../../host/tui/format.ts';

const realTimers = {
  setInterval: (fn: () => void, ms: number) => setInterval(fn, ms),
  clearInterval: (h: unknown) => clearInterval(h as NodeJS.Timeout),
  setTimeout: (fn: () => void, ms: number) => setTimeout(fn, ms),
  clearTimeout: (h: unknown) => clearTimeout(h as NodeJS.Timeout),
};

describe('plain fallback', () => {
  it('prints plain lines, never touches raw mode, ends with the numbers analyze gives', async () => {
    const scenario = loadScenario('demo-low-q');
    const lines = [...simulateJournal(scenario, { seed: 2, durationS: 400 }).lines];
    const stdout = new PassThrough();
    let text = '';
    stdout.on('data', (b: Buffer) => (text += b.toString('utf8')));
    const stdin = Object.assign(new PassThrough(), {
      isTTY: false,
      setRawMode: () => {
        throw new Error('raw mode is not supported without a terminal');
      },
    });
    let signalHandler: ((s: string) => void) | null = null;
    const code = await runLiveView({
      feed: simFeed({
        lines,
        scenarioName: scenario.name,
        speed: 1,
        // Unpaced: the test never waits on the wall clock.
        pace: async function* (l) {
          yield* l;
        },
      }),
      createPipeline: () => createRunPipeline(),
      stdout,
      stderr: new PassThrough(),
      stdin,
      nowMs: () => performance.now(),
      timers: realTimers,
      onSignal: (h) => ((signalHandler = h), () => (signalHandler = null)),
      plainEvery_s: 0.05,
    });
    expect(code).toBe(0);
    expect(signalHandler).toBeNull();
    expect(text).not.toMatch(/\x1b/);
    const last = text.trim().split('\n').at(-1)!;
    const r = analyzeEntries(lines.map(parseJournalLine));
    expect(last).toContain(`T0=${formatWithU(r.T0_s, r.T0_u_s).replace(' ± ', '±')} s`);
    expect(last).toContain(`g=${formatWithU(r.g_m_s2, r.g_u_m_s2).replace(' ± ', '±')} m/s²`);
    expect(last).toContain('ended: end of the simulated run');
  });
});

describe('watch through the CLI, piped', () => {
  it('replays a journal to the same T0, g, Q and pass count as `analyze --json`', async () => {
    const { execFileSync } = await import('node:child_process');
    const { mkdtempSync, writeFileSync } = await import('node:fs');
    const { tmpdir } = await import('node:os');
    const { join, resolve } = await import('node:path');
    const bin = resolve(import.meta.dirname, '..', '..', 'bin', 'halfswing.js');
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-tui-watch-'));
    const path = join(dir, 'club.journal');
    writeFileSync(path, `${[...simulateJournal(loadScenario('club-resonator'), { seed: 5, durationS: 900 }).lines].join('\n')}\n`);
    const shown = execFileSync(process.execPath, [bin, 'watch', path, '--speed', '1000000'], { encoding: 'utf8', env: { ...process.env, CI: 'true' } });
    const r = JSON.parse(execFileSync(process.execPath, [bin, 'analyze', path, '--json'], { encoding: 'utf8' })) as Record<string, number>;
    const last = shown.trim().split('\n').at(-1)!;
    expect(last).toContain(`T0=${formatWithU(r.T0_s, r.T0_u_s).replace(' ± ', '±')} s`);
    expect(last).toContain(`g=${formatWithU(r.g_m_s2, r.g_u_m_s2).replace(' ± ', '±')} m/s²`);
    expect(last).toContain(`Q=${formatWithU(r.Q, r.Q_u, 0).replace(' ± ', '±')}`);
    expect(last).toContain(`passes=${r.passes} `);
  });
});

describe('demo piped into a reader that stops early', () => {
  it('ends quietly with exit 0 when the pipe closes (`halfswing demo | head -1`)', async () => {
    const { spawn } = await import('node:child_process');
    const { resolve } = await import('node:path');
    const bin = resolve(import.meta.dirname, '..', '..', 'bin', 'halfswing.js');
    const child = spawn(process.execPath, [bin, 'demo', '--speed', '200'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let err = '';
    child.stderr.on('data', (b: Buffer) => (err += b.toString()));
    const first = await new Promise<string>((res) => child.stdout.once('data', (b: Buffer) => res(b.toString())));
    child.stdout.destroy();
    const code = await new Promise<number | null>((res) => child.on('exit', (c) => res(c)));
    expect(first).toMatch(/^run=/);
    expect(err).not.toContain('EPIPE');
    expect(code).toBe(0);
  });
});
