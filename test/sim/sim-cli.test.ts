// `halfswing sim`: help, listing, errors as one line, journal + truth files written whole, stdout streaming.
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

async function cli(args: string[], cwd = process.cwd()): Promise<{ code: number; out: string; err: string }> {
  const stdout = new PassThrough();
  const stderr = new PassThrough();
  let out = '';
  let err = '';
  stdout.on('data', (d) => (out += d));
  stderr.on('data', (d) => (err += d));
  const code = await runCli(args, { stdout, stderr, stdin: new PassThrough(), env: {}, cwd });
  return { code, out, err };
}

describe('halfswing sim', () => {
  it('--help lists every option', async () => {
    const r = await cli(['sim', '--help']);
    expect(r.code).toBe(0);
    for (const o of ['--scenario', '--list', '--journal', '--pty', '--speed', '--seed', '--duration', '--length', '--g', '--release', '--q', '--ppm', '--offset-mm'])
      expect(r.out).toContain(o);
  });

  it('--list names the bundled scenarios', async () => {
    const r = await cli(['sim', '--list']);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^demo-low-q +\S/m);
    expect(r.out).toMatch(/^night-run-faults +\S/m);
  });

  it('an unknown scenario or a bad option value is one line and a non-zero exit', async () => {
    const a = await cli(['sim', '-s', 'nope']);
    expect(a.code).toBe(1);
    expect(a.err.trim().split('\n')).toHaveLength(1);
    expect(a.err).toMatch(/unknown scenario "nope"/);
    const b = await cli(['sim', '--duration', 'soon']);
    expect(b.code).toBe(2);
    expect(b.err).toMatch(/--duration must be a time like/);
    const c = await cli(['sim', '--release', '0.2']);
    expect(c.code).toBe(2);
    expect(c.err).toMatch(/release_deg is too small/);
  });

  it('--journal writes the journal and its truth, and nothing else', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-sim-cli-'));
    const file = join(dir, 'run.journal');
    const r = await cli(['sim', '-s', 'club-resonator', '--journal', file, '--duration', '30s', '--seed', '4', '--ppm=-200']);
    expect(r.code).toBe(0);
    expect(readdirSync(dir).sort()).toEqual(['run.journal', 'run.journal.truth.json']);
    const text = readFileSync(file, 'latin1');
    const { lines } = simulateJournal(loadScenario('club-resonator'), { seed: 4, durationS: 30, ppm: -200 });
    expect(text).toBe([...lines].join('\n') + '\n');
    const truth = JSON.parse(readFileSync(`${file}.truth.json`, 'utf8'));
    expect(truth.clock.ppm).toBe(-200);
    expect(truth.complete).toBe(true);
    expect(truth.faults.counts.lines_journaled).toBe(text.split('\n').filter((l) => /^\d/.test(l)).length);
  });

  it('with neither --journal nor --pty the journal streams to stdout', async () => {
    const r = await cli(['sim', '--duration', '10s', '--seed', '2']);
    expect(r.code).toBe(0);
    const { lines } = simulateJournal(loadScenario('demo-low-q'), { seed: 2, durationS: 10 });
    expect(r.out).toBe([...lines].join('\n') + '\n');
  });
});

describe('writeScenarioJournal, paced', () => {
  it('grows the journal in place at N× real time; a stop leaves whole lines and no truth file', async () => {
    const { writeScenarioJournal } = await import('../../sim/index.ts');
    const { existsSync } = await import('node:fs');
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-sim-paced-'));
    const s = loadScenario('club-resonator');
    let now = 0;
    const slept: number[] = [];
    const full = join(dir, 'full.journal');
    await writeScenarioJournal(s, { seed: 1, durationS: 20, path: full, speed: 10, now: () => now, sleep: async (ms) => void (slept.push(ms), (now += ms)) });
    const { lines } = simulateJournal(s, { seed: 1, durationS: 20 });
    expect(readFileSync(full, 'latin1')).toBe([...lines].join('\n') + '\n');
    expect(existsSync(`${full}.truth.json`)).toBe(true);
    // 20 s of rig time at 10× is about 2 s of waiting on the injected clock.
    expect(now).toBeGreaterThan(1900);
    expect(now).toBeLessThan(2000);

    const part = join(dir, 'part.journal');
    const ac = new AbortController();
    now = 0;
    await writeScenarioJournal(s, {
      seed: 1,
      durationS: 20,
      path: part,
      speed: 10,
      signal: ac.signal,
      now: () => now,
      sleep: async (ms) => {
        now += ms;
        if (now > 1000) ac.abort();
      },
    });
    const text = readFileSync(part, 'latin1');
    expect(text.endsWith('\n')).toBe(true);
    expect(text.length).toBeLessThan(readFileSync(full, 'latin1').length);
    expect(readFileSync(full, 'latin1').startsWith(text)).toBe(true);
    expect(existsSync(`${part}.truth.json`)).toBe(false);
  });
});
