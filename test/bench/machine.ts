// Describes the machine a benchmark ran on, for the results table and the README.
import { readFileSync } from 'node:fs';
import { availableParallelism, loadavg, totalmem } from 'node:os';

export interface Machine {
  readonly cores: number;
  readonly cpu: string;
  readonly node: string;
  readonly memGiB: number;
  readonly platform: string;
  /** 1-minute load average when the run started: other work on a shared machine skews the timings. */
  readonly load1: number;
}

export function describeMachine(): Machine {
  let cpu = 'unknown';
  try {
    const m = /^model name\s*:\s*(.+)$/m.exec(readFileSync('/proc/cpuinfo', 'utf8'));
    if (m) cpu = m[1]!.trim();
  } catch {
    // Not Linux: the model stays unknown.
  }
  return {
    cores: availableParallelism(),
    cpu,
    node: process.version,
    memGiB: Math.round((totalmem() / 2 ** 30) * 10) / 10,
    platform: `${process.platform}-${process.arch}`,
    load1: Math.round(loadavg()[0]! * 100) / 100,
  };
}

export function machineLine(m: Machine): string {
  return `${m.cores} cores (nproc), ${m.cpu}, ${m.memGiB} GiB, Node ${m.node}, ${m.platform}; load average ${m.load1} at the start`;
}
