// The live view says what its figures belong to (#14 items 8 and 9), end to end on demo-low-q through the pipeline:
// g on the nominal clock says until when, the clock says when the host-clock fit takes over and since when it did,
// Q shows the amplitude it is quoted at, and T0 and g label their ± as k = 1.
import { describe, expect, it } from 'vitest';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { parseSimpleRig } from '../../protocol/rig.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { MIN_HOST_SPAN_S } from '../../host/pipeline/clock-choice.ts';
import { buildViewModel } from '../../host/tui/view-model.ts';
import { formatDuration } from '../../host/tui/format.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { demoStatus } from './snapshots.ts';

const entries: JournalEntry[] = [...simulateJournal(loadScenario('demo-low-q'), { seed: 1, durationS: 420 }).lines].map(parseJournalLine);
const rigEntry = entries.find((e) => e.kind === 'rig') as Extract<JournalEntry, { kind: 'rig' }>;
const rig = (() => {
  const r = parseSimpleRig(rigEntry.json);
  if (!r.ok) throw new Error('demo rig');
  return r.rig;
})();
const hostS = (e: JournalEntry): number | null => (e.kind === 'data' || e.kind === 'annotation' ? e.hostUs / 1e6 : null);

/** The view after the entries up to host time `s`. */
function viewAt(s: number) {
  const p = createRunPipeline();
  for (const e of entries) {
    const t = hostS(e);
    if (t !== null && t > s) break;
    p.push(e);
  }
  const live = p.live();
  const result = p.result({ rows: false });
  const vm = buildViewModel({ feed: demoStatus(), live, result, rig, now_s: s, since_s: 0, heartbeatInterval_s: 1, restartedAt_s: null, paused: false });
  const row = (label: string) => vm.numbers.find((r) => r.label === label)!;
  return { vm, live, result, row, clock: vm.status.find((x) => x.label === 'clock')!.value };
}

describe('live figures with their context', () => {
  const firstBeat = entries.map(hostS).find((t, i) => t !== null && (entries[i] as { line?: string }).line?.startsWith('T ')) as number;
  const from = formatDuration(firstBeat + MIN_HOST_SPAN_S);

  it('before the host-clock fit: g says until when it is on the nominal clock, the clock says when the fit starts', () => {
    const v = viewAt(120);
    expect(v.result.clock_source).toBe('nominal');
    expect(v.result.g_m_s2).not.toBeNull();
    // The announced start: the first heartbeat + MIN_HOST_SPAN_S (300 s) on the host clock.
    expect(v.row('g').note).toBe(`k = 1; nominal clock until ${from}`);
    expect(v.clock).toBe(`nominal (±2887 ppm), host fit at ${from}`);
    expect(v.row('T0').note).toBe('k = 1');
    expect(v.row('g').value).toMatch(/^\d\.\d+ ± \d\.\d+$/);
  });

  it('after it: the clock is the fitted rate and says since when; g keeps only its k', () => {
    const v = viewAt(400);
    expect(v.result.clock_source).toBe('host');
    // The simulated board runs 120 ppm fast (demo-low-q.json): the fitted correction is near that.
    const m = /^([+-]\d+\.\d+) ± (\d\.\d+) ppm \(host since (\d+:\d\d)\)$/.exec(v.clock);
    expect(m, v.clock).not.toBeNull();
    expect(Math.abs(Math.abs(Number(m![1])) - 120)).toBeLessThan(5);
    expect(m![3]).toBe(from);
    expect(v.row('g').note).toBe('k = 1');
  });

  it('Q shows the amplitude it belongs to (the median amplitude of the run so far, as analyze quotes it)', () => {
    const v = viewAt(400);
    expect(v.result.Q).not.toBeNull();
    expect(v.row('Q').note).toBe(`at ${v.result.median_amplitude_deg!.toFixed(1)}°`);
    // The demo decays from 35°: the median of the first 400 s lies well inside the run's range.
    expect(v.result.median_amplitude_deg!).toBeGreaterThan(v.result.amplitude_end_deg!);
    expect(v.result.median_amplitude_deg!).toBeLessThan(v.result.amplitude_start_deg!);
  });
});
