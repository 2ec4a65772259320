// Holds a sleep inhibitor (systemd-inhibit) while recording, where the system offers one.
import { spawn as nodeSpawn, type ChildProcess } from 'node:child_process';

/** The inhibitor as it turned out: held, or why not. */
export interface SleepInhibitor {
  readonly held: boolean;
  /** One line for the user: what is held, or why nothing is. */
  readonly note: string;
  /** Releases it (idempotent). */
  release(): void;
}

export interface InhibitOptions {
  readonly why: string;
  readonly spawn?: typeof nodeSpawn;
  /** How long the helper must stay up to count as holding the lock (ms). */
  readonly settleMs?: number;
  readonly platform?: NodeJS.Platform;
}

/**
 * Runs `systemd-inhibit --what=sleep:idle … cat` with its stdin a pipe from us: if this process dies, even by
 * SIGKILL, the pipe closes, `cat` ends and logind drops the lock, so no inhibitor outlives the recorder.
 * Lid-close handling needs privileges (HandleLidSwitch in logind.conf; see hardware-notes/unattended-runs.md).
 */
export async function holdSleepInhibitor(opts: InhibitOptions): Promise<SleepInhibitor> {
  const platform = opts.platform ?? process.platform;
  if (platform !== 'linux') return none(`no sleep inhibitor on ${platform}: keep the computer from sleeping in its power settings`);
  const spawn = opts.spawn ?? nodeSpawn;
  let child: ChildProcess;
  try {
    child = spawn('systemd-inhibit', ['--what=sleep:idle', '--who=halfswing record', `--why=${opts.why}`, '--mode=block', 'cat'], {
      stdio: ['pipe', 'ignore', 'pipe'],
    });
  } catch (e) {
    return none(`no sleep inhibitor (${(e as Error).message})`);
  }
  let stderr = '';
  child.stderr?.on('data', (d: Buffer) => (stderr += d.toString('utf8')));
  child.stdin?.on('error', () => {});
  const outcome = await new Promise<'up' | string>((resolve) => {
    const t = setTimeout(() => resolve('up'), opts.settleMs ?? 400);
    child.once('error', (e: NodeJS.ErrnoException) => {
      clearTimeout(t);
      resolve(e.code === 'ENOENT' ? 'systemd-inhibit is not installed' : e.message);
    });
    child.once('exit', (code) => {
      clearTimeout(t);
      resolve(stderr.trim().split('\n')[0] || `systemd-inhibit exited with ${code}`);
    });
  });
  if (outcome !== 'up') return none(`no sleep inhibitor (${outcome}): keep the computer from sleeping by other means`);
  // The helper must never keep our event loop alive.
  child.unref();
  (child.stdin as unknown as { unref?: () => void } | null)?.unref?.();
  (child.stderr as unknown as { unref?: () => void } | null)?.unref?.();
  let released = false;
  return {
    held: true,
    note: 'holding a sleep inhibitor (systemd-inhibit --what=sleep:idle)',
    release() {
      if (released) return;
      released = true;
      child.stdin?.end();
      child.kill('SIGTERM');
    },
  };
}

function none(note: string): SleepInhibitor {
  return { held: false, note, release() {} };
}
