// The rig's `beams` key: one or two beams on channels 0 and 1, replacing `channel`.
import { describe, expect, it } from 'vitest';
import { parseRig, rigJson } from '../../protocol/rig.ts';

const base = { length_m: 1, flag_width_m: 0.02 };

describe('rig beams', () => {
  it('accepts two beams and writes them back without a channel key', () => {
    const r = parseRig({ ...base, beams: [{ channel: 1, angle_deg: 45 }, { channel: 0, angle_deg: -45 }] });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.rig.beams[0].channel).toBe(1);
    const text = rigJson(r.rig);
    expect(JSON.parse(text).channel).toBeUndefined();
    expect(parseRig(text)).toEqual(r);
  });

  it('refuses a rig with both beams and channel, and malformed beams, in one line each', () => {
    const bad = [
      { ...base, channel: 0, beams: [{ channel: 0, angle_deg: 0 }] },
      { ...base, beams: [] },
      { ...base, beams: [{ channel: 2, angle_deg: 0 }] },
      { ...base, beams: [{ channel: 0, angle_deg: 'x' }] },
      { ...base, beams: [{ channel: 0, angle_deg: 0 }, { channel: 0, angle_deg: 90 }] },
      { ...base, beams: [{ channel: 0, angle_deg: 0, extra: 1 }] },
    ];
    for (const b of bad) {
      const r = parseRig(b);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error).not.toContain('\n');
    }
  });

  it('reads a rig without beams as one beam on its channel at 0°, and writes it back as channel', () => {
    const r = parseRig(base);
    expect(r.ok && r.rig.beams).toEqual([{ channel: 0, angle_deg: 0 }]);
    expect(r.ok && JSON.parse(rigJson(r.rig))).toMatchObject({ channel: 0 });
    expect(r.ok && JSON.parse(rigJson(r.rig)).beams).toBeUndefined();
  });
});
