// The end of a decay (#14 item 5), end to end: `watch` of demo-low-q (a real journal file, the real follower, the
// live store and the view model) shows the same last valid swing as `analyze` of the same file: its half-periods,
// its period (none: the last valid passes barely cleared the beam) and its amplitude, the JSON's amplitude_end_deg.
// The silence warning says the bob swings inside the flag, with its size, not that it may rest in the beam.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { JournalEntry } from '../../protocol/journal.ts';
import type { SwingRow } from '../../host/analysis/result.ts';
import { analyzeJournalFile } from '../../host/pipeline/analyze-entries.ts';
import { followJournal } from '../../host/journal/follow-journal.ts';
import { journalFeed } from '../../host/tui/feeds/journal-feed.ts';
import { createLiveStore } from '../../host/tui/live-store.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { buildViewModel } from '../../host/tui/view-model.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';

const LEFT_OUT = new Set(['unsequenced', 'rejected:transit', 'rejected:timing']);
const isValid = (r: SwingRow): boolean => !r.flags.some((f) => LEFT_OUT.has(f));

describe('end of a decay: watch and analyze agree on the last valid swing (demo-low-q, seed 1, 900 s)', () => {
  it('half-periods, period and amplitude as analyze gives them; the warning says the bob swings ±X mm inside the 30 mm flag', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'halfswing-end-of-decay-'));
    const path = join(dir, 'demo.journal');
    const lines = [...simulateJournal(loadScenario('demo-low-q'), { seed: 1 }).lines];
    writeFileSync(path, `${lines.join('\n')}\n`, 'latin1');

    // analyze: the rows (what --csv writes) and the figures (what --json prints).
    const { result } = await analyzeJournalFile(path);
    const valid = result.swings.filter(isValid);
    const last = valid.at(-1)!;
    const before = valid.at(-2)!;
    // The decay ends with passes left out after the last valid one (the swing no longer clears the beam).
    expect(result.swings.at(-1)!.flags).toContain('unsequenced');
    expect(last.amplitude_deg!).toBeCloseTo(result.amplitude_end_deg!, 10);

    // watch: the journal followed through the feed into the live store, as `halfswing watch FILE` does.
    const feed = journalFeed({ path, follow: (p, o) => followJournal(p, { ...o, pollMs: 10 }), sizeOf: (p) => readFileSync(p).length, nowMs: () => 0 });
    const store = createLiveStore({ createPipeline: () => createRunPipeline(), nowMs: () => 0, timers: { setInterval: () => 0, clearInterval: () => {} } });
    const it = feed.entries[Symbol.asyncIterator]();
    for (let k = 0; k < lines.length; k++) store.push((await it.next()).value as JournalEntry);
    await store.flush();
    const snap = store.getSnapshot();
    const vm = buildViewModel({ feed: feed.status(), live: snap.live, result: snap.result, rig: snap.rig, now_s: snap.lastHost_s!, since_s: 0, heartbeatInterval_s: snap.heartbeatInterval_s, restartedAt_s: null, paused: false });
    store.stop();
    await feed.close();

    // The live swing is analyze's last valid row: the same arithmetic on the same passes (amplitudes: the window's T0,
    // within 1e-4 relative, test/pipeline/pipeline-live-estimate.test.ts).
    const l = snap.live;
    expect(l.halfPeriodsS[0]).toBeCloseTo(before.half_period_s!, 9);
    expect(l.halfPeriodsS[1]).toBeCloseTo(last.half_period_s!, 9);
    expect(l.periodS).toBe(last.period_s);
    expect(Math.abs(l.amplitudeDeg! / last.amplitude_deg! - 1)).toBeLessThan(1e-4);
    const row = (label: string) => vm.numbers.find((r) => r.label === label)!.value;
    expect(row('half-periods')).toBe(`${before.half_period_s!.toFixed(5)}  ${last.half_period_s!.toFixed(5)}`);
    expect(row('period')).toBe(last.period_s === null ? '—' : last.period_s.toFixed(5));
    expect(row('amplitude')).toBe(result.amplitude_end_deg!.toFixed(2));
    // Not a full period shown as a half-period: both halves are near half of T0 (the issue saw 1.556 s for T0 ≈ 1.56 s).
    for (const h of l.halfPeriodsS) expect(h! / result.T0_s!).toBeLessThan(0.6);

    // The warning: the swing's last measured size, L·sin(A), inside the rig's 30 mm flag; never "resting".
    const silent = vm.warnings.find((w) => w.kind === 'no-passes')!;
    const mm = 0.6 * Math.sin((l.amplitudeDeg! * Math.PI) / 180) * 1000;
    expect(silent.text).toContain(`the bob swings inside the 30 mm flag (at most ±${mm.toFixed(0)} mm, its last measured swing)`);
    expect(silent.text).not.toMatch(/rest/);
  }, 60_000);
});
