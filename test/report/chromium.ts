// Test helper: headless Chromium with no network and a fresh profile, to screenshot, dump the DOM or print a page.
import { execFile } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { delimiter, join } from 'node:path';
import { pathToFileURL } from 'node:url';

const NAMES = ['chromium', 'chromium-browser', 'google-chrome'];

/** The browser binary found on PATH (Debian's package installs `chromium`), or null when none is installed. */
export function findChromium(): string | null {
  for (const dir of (process.env.PATH ?? '').split(delimiter).filter(Boolean)) {
    for (const n of NAMES) if (existsSync(join(dir, n))) return join(dir, n);
  }
  return null;
}

// Everything that could reach a network is off: the machine has none, and a report must not need one.
const FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-extensions',
  '--disable-default-apps',
  '--no-first-run',
  '--no-default-browser-check',
  '--disable-quic',
  '--hide-scrollbars',
];

/** Runs Chromium on a local file with extra flags; resolves to stdout. Each call gets its own profile dir. */
export function runChromium(bin: string, file: string, extra: readonly string[]): Promise<string> {
  const profile = mkdtempSync(join(tmpdir(), 'halfswing-chromium-'));
  return new Promise((resolve, reject) => {
    execFile(
      bin,
      [...FLAGS, `--user-data-dir=${profile}`, ...extra, pathToFileURL(file).href],
      { timeout: 90_000, maxBuffer: 64 * 1024 * 1024, env: { ...process.env, HOME: profile } },
      (err, stdout, stderr) => {
        rmSync(profile, { recursive: true, force: true });
        if (err) reject(new Error(`chromium failed: ${err.message}\n${stderr.slice(-2000)}`));
        else resolve(stdout);
      },
    );
  });
}
