// analyze's text summary (host/output/format-summary.ts): the headline figures quoted by the one rule of
// host/output/value-u.ts, each ± labelled with its coverage factor (#14 item 8).
import { describe, expect, it } from 'vitest';
import { formatSummary } from '../../host/output/format-summary.ts';
import { EMPTY_RESULT } from '../../host/analysis/result.ts';
import { syntheticResult } from '../report/fixture-result.ts';

const line = (text: string, label: string): string => text.split('\n').find((l) => l.startsWith(`  ${label.padEnd(17)}`))!;

describe('text summary', () => {
  const r = syntheticResult({ g_m_s2: 9.81263, g_u_m_s2: 0.005595, T0_s: 2.0060713, T0_u_s: 3.1e-6 });
  const text = formatSummary(r, 'bench-a.journal');

  it('g at k = 1 and the expanded k = 2 figure, rounded alike (the issue’s ± 0.0056 with ± 0.01119 beside it)', () => {
    expect(line(text, 'g')).toBe('  g                9.8126 ± 0.0056 m/s² (k = 1); expanded 9.813 ± 0.011 m/s² (k = 2)');
    expect(text).not.toMatch(/0\.01119/);
  });

  it('T0 labelled k = 1; B, C, clock, Q at k = 1 under the one closing note', () => {
    expect(line(text, 'T0')).toBe('  T0               2.0060713 ± 0.0000031 s (k = 1)   (zero amplitude, exact law 2K/π)');
    expect(line(text, 'B, C')).toContain('B = 0.06270 ± 0.00040');
    expect(line(text, 'clock')).toContain('-1234.50 ± 0.80 ppm');
    expect(text).toContain('  ± is one standard uncertainty (k = 1); an expanded one is labelled k = 2\n');
  });

  it('amplitudes carry their uncertainty when the analysis gives one', () => {
    const a = formatSummary(syntheticResult({ amplitude_start_deg: 24.98843, amplitude_start_u_deg: 0.0123, amplitude_end_deg: 3.21, amplitude_end_u_deg: 0.004 }), 'x');
    expect(line(a, 'amplitude')).toBe('  amplitude        24.988 ± 0.012° → 3.2100 ± 0.0040°');
  });

  it('a run without figures shows dashes and no label', () => {
    const t = formatSummary({ ...EMPTY_RESULT, run: r.run }, 'short.journal');
    expect(line(t, 'T0')).toMatch(/^ {2}T0 {15}— {3}/);
    expect(line(t, 'g')).toBe('  g                —');
  });
});
