// A bundled scenario of 15 minutes with the shipped firmware as its device (`sim --firmware`): the journal
// the firmware's own lines make must analyse like the device model's, against the simulator's truth.
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough } from 'node:stream';
import { afterAll, expect, it } from 'vitest';
import { runCli } from '../../host/cli/main.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import type { Truth } from '../../sim/index.ts';
import { describeFirmware } from './toolchain-gate.ts';

const dir = mkdtempSync(join(tmpdir(), 'halfswing-fw-e2e-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function cli(args: string[]): Promise<{ code: number; err: string }> {
  const stderr = new PassThrough();
  let err = '';
  stderr.on('data', (d) => (err += d));
  const code = await runCli(args, { stdout: new PassThrough(), stderr, stdin: new PassThrough(), env: {}, cwd: dir });
  return { code, err };
}

async function simAndAnalyze(extra: string[], name: string) {
  const path = join(dir, `${name}.hsj`);
  const r = await cli(['sim', '-s', 'demo-low-q', '--seed', '4', '-o', path, ...extra]);
  expect(r.code, r.err).toBe(0);
  const truth = JSON.parse(readFileSync(`${path}.truth.json`, 'utf8')) as Truth;
  const entries = readFileSync(path, 'latin1').split('\n').filter((l) => l !== '').map(parseJournalLine);
  return { truth, result: analyzeEntries(entries) };
}

describeFirmware('sim --firmware: a bundled scenario through the shipped firmware, then analyze', () => {
  it('demo-low-q (15 min, with bounce): T0 and g within their k = 2 intervals of the truth, as on the model path, and the same passes', async () => {
    const fw = await simAndAnalyze(['--firmware'], 'firmware');
    const model = await simAndAnalyze([], 'model');
    expect(fw.truth.device).toBe('emulated firmware');
    expect(fw.truth.duration_s).toBeGreaterThanOrEqual(600);
    // The gate's faults went through the firmware's input: its bounce edges were captured, not lost.
    expect(fw.truth.faults.counts.bounce_pulses).toBeGreaterThan(0);
    expect(fw.truth.faults.counts.bounce_pulses).toBe(model.truth.faults.counts.bounce_pulses);
    for (const { truth, result: r } of [fw, model]) {
      // The same tolerance on both paths: the analysis's own expanded (k = 2) uncertainty against the simulator's truth.
      expect(Math.abs(r.T0_s! - truth.physics.T0_s)).toBeLessThan(2 * r.T0_u_s!);
      expect(Math.abs(r.g_m_s2! - truth.physics.g_m_s2)).toBeLessThan(2 * r.g_u_m_s2!);
    }
    expect(fw.result.passes).toBe(model.result.passes);
    expect(fw.result.passes).toBeGreaterThan(300); // low Q: the swing dies out within the run
    // Same edges on the same device clock: the two T0 differ by far less than either's uncertainty.
    expect(Math.abs(fw.result.T0_s! - model.result.T0_s!)).toBeLessThan(0.1 * model.result.T0_u_s!);
    console.log(
      `firmware path: ${fw.result.passes} passes, T0 ${fw.result.T0_s!.toFixed(7)} ± ${fw.result.T0_u_s!.toExponential(2)} s, g ${fw.result.g_m_s2!.toFixed(5)}; ` +
        `model path: T0 ${model.result.T0_s!.toFixed(7)}, g ${model.result.g_m_s2!.toFixed(5)}; truth T0 ${fw.truth.physics.T0_s.toFixed(7)}`,
    );
  }, 120_000);
});
