// Smoke test of `npm run bench`: every benchmark runs at tiny sizes and reports numbers (no timing is asserted),
// and the statistics the benchmarks compare against are checked against published values.
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import fc from 'fast-check';
import { afterAll, describe, expect, it } from 'vitest';
import { missingToolchain } from '../../sim/emulator/toolchain.ts';
import type { FigureResult } from '../bench/report.ts';
import { renderTable } from '../bench/report.ts';
import { fitHalfPeriod, lsSlopeSigma, quantile } from '../bench/stats.ts';

const run = promisify(execFile);
const dir = mkdtempSync(join(tmpdir(), 'halfswing-bench-smoke-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('bench statistics', () => {
  it('LS slope bound matches the Monte Carlo values of docs/references.md#ref-timing-statistics (σ = 1)', () => {
    // σ√(12/(N(N²−1))): Bevington & Robinson ch. 6 / Kay vol. I Ex. 3.4 (from memory); values recomputed there.
    expect(lsSlopeSigma(1, 10)).toBeCloseTo(0.1101, 4);
    expect(lsSlopeSigma(1, 20)).toBeCloseTo(0.03878, 5);
    expect(lsSlopeSigma(1, 100)).toBeCloseTo(0.00346, 5);
  });

  it('the alternating line fit recovers any half-period and gate offset exactly from noiseless passes', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 5, noNaN: true }), fc.double({ min: -1e-3, max: 1e-3, noNaN: true }), fc.integer({ min: 4, max: 300 }), (half, alt, n) => {
        const k = Array.from({ length: n }, (_, i) => i);
        const t = k.map((i) => 3 + half * i + (i % 2 === 0 ? alt : -alt));
        expect(fitHalfPeriod(k, t)).toBeCloseTo(half, 9);
      }),
    );
  });

  it('quantile interpolates between order statistics', () => {
    expect(quantile([4, 1, 3, 2], 0.5)).toBe(2.5);
    expect(quantile([1, 2, 3, 4, 5], 0.25)).toBe(2);
  });
});

describe('npm run bench --quick', () => {
  const missing = missingToolchain();
  if (missing.length > 0 && process.env.CI !== 'true') {
    process.stderr.write(`bench smoke: emulator figures not checked (missing ${missing.join(', ')}; apt-get install gcc-avr avr-libc simavr libsimavr-dev libelf-dev)\n`);
  }

  it('runs every benchmark and writes a results file with finite numbers', { timeout: 240_000 }, async () => {
    const out = join(dir, 'results.json');
    const { stdout } = await run(process.execPath, ['bin/tsx-run.js', 'test/bench/run.ts', '--quick', '--json', '--out', out], { maxBuffer: 64 * 1024 * 1024 });
    const printed = JSON.parse(stdout.trim().split('\n').pop()!) as { results: FigureResult[] };
    const written = JSON.parse(readFileSync(out, 'utf8')) as { results: FigureResult[]; machine: { cores: number } };
    expect(written.results.map((r) => r.id)).toEqual(printed.results.map((r) => r.id));
    expect(written.machine.cores).toBeGreaterThan(0);
    expect(printed.results.map((r) => r.id)).toEqual(['start', 'ingest', 'live', 'sim', 'firmware', 'estimator', 'hand', 'combine']);
    for (const r of printed.results) {
      if (r.id === 'firmware' && missing.length > 0 && process.env.CI !== 'true') continue;
      expect(r.notMeasured, `${r.id}: ${r.notMeasured}`).toBeUndefined();
      expect(r.rows.length).toBeGreaterThan(0);
      for (const row of r.rows) if (row.value !== null) expect(Number.isFinite(row.value), `${r.id}: ${row.figure}`).toBe(true);
    }
    const table = renderTable(printed.results);
    for (const r of printed.results) expect(table).toContain(`| ${r.id}: `);
  });
});
