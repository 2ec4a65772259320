// The worker-thread result source gives exactly what `analyzeEntries` gives for the same entries.
import { describe, expect, it } from 'vitest';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { parseJournalLine } from '../../protocol/journal.ts';
import { analyzeEntries } from '../../host/pipeline/analyze-entries.ts';
import { inThreadResultSource, workerResultSource } from '../../host/pipeline/result-client.ts';

const entries = [...simulateJournal(loadScenario('demo-low-q'), { seed: 7, durationS: 600 }).lines].map(parseJournalLine);

describe('result worker', () => {
  it('answers each request for exactly the entries pushed before it, like analyzeEntries', async () => {
    const src = workerResultSource();
    try {
      expect(src.inThread).toBe(false);
      const half = Math.floor(entries.length / 2);
      entries.slice(0, half).forEach((e) => src.push(e));
      const first = src.result();
      entries.slice(half).forEach((e) => src.push(e));
      const [a, b] = await Promise.all([first, src.result()]);
      expect(a).toEqual(analyzeEntries(entries.slice(0, half)));
      expect(b).toEqual(analyzeEntries(entries));
      expect(b.g_m_s2).not.toBeNull();
      src.reset();
      entries.slice(0, half).forEach((e) => src.push(e));
      expect(await src.result()).toEqual(a);
    } finally {
      await src.close();
    }
  });

  it('rejects requests once closed, and the in-thread fallback agrees too', async () => {
    const src = workerResultSource();
    await src.close();
    await expect(src.result()).rejects.toThrow(/stopped/);
    const local = inThreadResultSource();
    entries.forEach((e) => local.push(e));
    expect(await local.result()).toEqual(analyzeEntries(entries));
  });
});
