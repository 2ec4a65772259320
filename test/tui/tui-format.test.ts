// Formatting of values with uncertainty, durations, sizes and speeds for the live view.
import { describe, expect, it } from 'vitest';
import { formatBytes, formatDuration, formatFixed, formatSpeed, formatWithU } from '../../host/tui/format.ts';
import { decimalsForU } from '../../host/output/value-u.ts';

describe('formatWithU', () => {
  // Two significant digits on the uncertainty and the value rounded to the same place: common practice
  // (JCGM 100:2008, GUM §7.2.6, says "at most two significant digits"; docs/references.md#ref-uncertainty-rounding).
  it('shows u with two significant digits and the value to match', () => {
    expect(formatWithU(9.812345, 0.00987)).toBe('9.8123 ± 0.0099');
    expect(formatWithU(2.0065231, 0.0000123)).toBe('2.006523 ± 0.000012');
    expect(formatWithU(2987.43, 1.23)).toBe('2987.4 ± 1.2');
    expect(formatWithU(1234.5, 56)).toBe('1235 ± 56');
  });
  it('falls back to fixed decimals without an uncertainty, and a dash without a value', () => {
    expect(formatWithU(9.81234, null)).toBe('9.8123');
    expect(formatWithU(null, 0.1)).toBe('—');
    expect(formatWithU(NaN, 0.1)).toBe('—');
  });
  it('decimals follow the leading digit of u', () => {
    expect(decimalsForU(0.0099)).toBe(4);
    expect(decimalsForU(0.01)).toBe(3);
    expect(decimalsForU(5)).toBe(1);
    expect(decimalsForU(50)).toBe(0);
  });
});

describe('small formatters', () => {
  it('signs offsets and never shows −0', () => {
    expect(formatFixed(1.234, 1, true)).toBe('+1.2');
    expect(formatFixed(-1.234, 1, true)).toBe('-1.2');
    expect(formatFixed(-0.01, 1, true)).toBe('0.0');
    expect(formatFixed(undefined, 1)).toBe('—');
  });
  it('durations as m:ss or h:mm:ss', () => {
    expect(formatDuration(0)).toBe('0:00');
    expect(formatDuration(599.9)).toBe('9:59');
    expect(formatDuration(3600 + 62)).toBe('1:01:02');
  });
  it('sizes in powers of 1000', () => {
    expect(formatBytes(999)).toBe('999 B');
    expect(formatBytes(1234)).toBe('1.23 kB');
    expect(formatBytes(12_345_678)).toBe('12.3 MB');
  });
  it('speed factors', () => {
    expect(formatSpeed(1)).toBe('real time');
    expect(formatSpeed(20)).toBe('×20');
    expect(formatSpeed(0.5)).toBe('×0.50');
  });
});
