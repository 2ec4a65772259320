import { describe, expect, it } from 'vitest';
import { SequenceTracker } from '../../protocol/sequence.ts';
import type { DeviceRecord } from '../../protocol/records.ts';

const hello = (seq: number, boot: number): DeviceRecord => ({ kind: 'H', seq, proto: 1, fw: '1.0.0', mcu: 'm328p', hz: 16e6, ch: 2, boot, extra: {} });
const beat = (seq: number, ticks: number): DeviceRecord => ({ kind: 'T', seq, ticks, lost: 0, levels: 0 });

describe('SequenceTracker', () => {
  it('counts lines missing in a gap', () => {
    const t = new SequenceTracker();
    t.push(hello(0, 0x1234));
    t.push(beat(1, 16e6));
    expect(t.push(beat(5, 32e6)).lostBefore).toBe(3);
    expect(t.totals().linesLost).toBe(3);
  });

  it('counts across the ffff → 0 wrap', () => {
    const t = new SequenceTracker();
    t.push(hello(0xfffd, 1));
    expect(t.push(beat(0xfffe, 1e9)).lostBefore).toBe(0);
    expect(t.push(beat(0xffff, 1.1e9)).lostBefore).toBe(0);
    expect(t.push(beat(0, 1.2e9)).lostBefore).toBe(0);
    expect(t.push(beat(3, 1.3e9)).lostBefore).toBe(2);
  });

  it('sees a reboot in a hello with a new boot id, not as lost lines', () => {
    const t = new SequenceTracker();
    t.push(hello(0, 1));
    t.push(beat(1, 16e6));
    const r = t.push(hello(0, 2));
    expect(r).toMatchObject({ newBoot: true, lostBefore: 0, bootIndex: 1 });
    expect(t.totals()).toMatchObject({ reboots: 1, linesLost: 0 });
  });

  it('a repeated hello of the same boot (reply to ?) is not a reboot', () => {
    const t = new SequenceTracker();
    t.push(hello(0, 7));
    t.push(beat(1, 16e6));
    expect(t.push(hello(2, 7)).newBoot).toBe(false);
  });

  it('sees a reboot whose hello was lost from ticks running backwards with a broken sequence', () => {
    const t = new SequenceTracker();
    t.push(hello(0, 1));
    for (let i = 1; i < 100; i++) t.push(beat(i, i * 16e6));
    const r = t.push(beat(1, 16e6));
    expect(r.newBoot).toBe(true);
    expect(t.totals()).toMatchObject({ reboots: 1, linesLost: 0 });
  });
});
