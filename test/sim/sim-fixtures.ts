// Test helpers: small scenarios built in code, and a decoder pass over a simulated journal.
import { decodeLine, SequenceTracker, parseJournalLine, type DeviceRecord } from '../../protocol/index.ts';
import { parseScenario, simulateJournal, type Scenario, type Truth } from '../../sim/index.ts';

/** A 1 m steel-ball rig with a quiet gate, plus whatever the test adds. */
export function testScenario(extra: Record<string, unknown> = {}): Scenario {
  const base: Record<string, unknown> = {
    name: 'test-rig',
    rig: { length_m: 1, flag_width_m: 0.0254, bob_diameter_m: 0.0254 },
    duration_s: 120,
    physics: { g_m_s2: 9.80665, release_deg: 10, linear_q: 3000 },
    gate: { offset_m: 0.0005, jitter_us: 2 },
  };
  return parseScenario({ ...base, ...extra });
}

export interface DecodedRun {
  readonly truth: Truth;
  readonly text: string;
  readonly records: { hostUs: number; record: DeviceRecord }[];
  readonly rejected: { hostUs: number; line: string; reason: string }[];
  readonly annotations: { hostUs: number; word: string }[];
  readonly tracker: SequenceTracker;
}

/** Simulates and decodes every data line through the protocol codec and sequence tracker. */
export function decodeRun(s: Scenario, seed: number, durationS?: number): DecodedRun {
  const { lines, truth } = simulateJournal(s, { seed, durationS });
  const out: DecodedRun = { truth, text: '', records: [], rejected: [], annotations: [], tracker: new SequenceTracker() };
  const text: string[] = [];
  for (const l of lines) {
    text.push(l);
    const e = parseJournalLine(l);
    if (e.kind === 'annotation') out.annotations.push({ hostUs: e.hostUs, word: e.word });
    if (e.kind !== 'data') continue;
    const d = decodeLine(e.line);
    if (d.ok) {
      out.records.push({ hostUs: e.hostUs, record: d.record });
      out.tracker.push(d.record);
    } else out.rejected.push({ hostUs: e.hostUs, line: e.line, reason: d.reason });
  }
  return { ...out, text: text.join('\n') };
}

/** Count of records of one kind. */
export function countKind(run: DecodedRun, kind: DeviceRecord['kind']): number {
  return run.records.filter((r) => r.record.kind === kind).length;
}
