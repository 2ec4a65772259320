// Runs a child process and measures its wall time, CPU time and peak resident memory (GNU time's %M).
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';

export interface ChildStats {
  readonly code: number | null;
  readonly wallS: number;
  /** Peak RSS in MiB, or null where GNU time is not installed. */
  readonly peakRssMiB: number | null;
  readonly cpuS: number | null;
  readonly stdout: string;
  readonly stderr: string;
}

const GNU_TIME = '/usr/bin/time';

/** True when peak RSS of children can be measured here (Debian package `time`). */
export function canMeasureRss(): boolean {
  return existsSync(GNU_TIME);
}

/** Spawns `cmd args`, waits for it, and returns its exit code, output and resource use. */
export async function runMeasured(cmd: string, args: readonly string[], opts: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): Promise<ChildStats> {
  const dir = mkdtempSync(join(tmpdir(), 'halfswing-bench-time-'));
  const out = join(dir, 'time.txt');
  const useTime = canMeasureRss();
  const [file, argv] = useTime ? [GNU_TIME, ['-f', '%M %U %S', '-o', out, cmd, ...args]] : [cmd, [...args]];
  try {
    const t0 = performance.now();
    const res = await new Promise<{ code: number | null; stdout: string; stderr: string }>((resolve, reject) => {
      const child = spawn(file, argv, { cwd: opts.cwd, env: opts.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
      const so: Buffer[] = [];
      const se: Buffer[] = [];
      child.stdout.on('data', (b: Buffer) => so.push(b));
      child.stderr.on('data', (b: Buffer) => se.push(b));
      child.on('error', reject);
      child.on('close', (code) => resolve({ code, stdout: Buffer.concat(so).toString('utf8'), stderr: Buffer.concat(se).toString('utf8') }));
    });
    const wallS = (performance.now() - t0) / 1000;
    let peakRssMiB: number | null = null;
    let cpuS: number | null = null;
    if (useTime && existsSync(out)) {
      const last = readFileSync(out, 'utf8').trim().split('\n').pop() ?? '';
      const [kb, u, s] = last.split(' ').map(Number);
      if (kb !== undefined && Number.isFinite(kb)) peakRssMiB = kb / 1024;
      if (u !== undefined && s !== undefined && Number.isFinite(u + s)) cpuS = u + s;
    }
    return { ...res, wallS, peakRssMiB, cpuS };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
