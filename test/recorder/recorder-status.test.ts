import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildStatus, statusLine } from '../../host/session/recorder-status.ts';
import { writeStatusFile } from '../../host/journal/status-file.ts';

let dir: string;
beforeEach(() => (dir = mkdtempSync(join(tmpdir(), 'halfswing-status-'))));
afterEach(() => rmSync(dir, { recursive: true, force: true }));

const link = { bytes: 0, lines: 1200, validLines: 1197, lineErrors: 3, overLong: 1, tailsDiscarded: 0, reconnects: 2, heartbeatMs: 1000 };

describe('recorder status', () => {
  it('the status line shows passes, last period, amplitude, g so far, line errors, lost, reconnects', () => {
    const s = buildStatus({
      wall: new Date('2026-03-01T12:34:56.000Z'),
      pid: 1,
      state: 'connected',
      port: '/dev/ttyACM0',
      journal: 'j',
      journalBytes: 100,
      hostUs: 3_600_000_000,
      linesPerS: 5,
      link,
      live: undefined,
      g: { value: 9.81234, u: 0.00042 },
      warnings: ['no sleep inhibitor'],
    });
    expect(statusLine(s)).toBe(
      '12:34:56 connected  passes 0  T –  amp –  g 9.81234 ± 0.00042  line errors 3  lost 0+0  reconnects 2  ! no sleep inhibitor',
    );
    expect(s).toMatchObject({ uptime_s: 3600, line_errors: 3, reconnects: 2, g_m_s2: 9.81234 });
  });

  it('the status file is replaced whole, and no temporary file is left', () => {
    const p = join(dir, 'status.json');
    writeStatusFile(p, { a: 1 });
    writeStatusFile(p, { a: 2 });
    expect(JSON.parse(readFileSync(p, 'utf8'))).toEqual({ a: 2 });
    expect(readdirSync(dir)).toEqual(['status.json']);
    expect(() => writeStatusFile(join(dir, 'no', 's.json'), {})).toThrow(/cannot write status file .*ENOENT/);
  });
});
