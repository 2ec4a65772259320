import { describe, expect, it } from 'vitest';
import { openDeviceLink } from '../../host/link/device-link.ts';
import { describeLevels, formatProbe, probeBoard } from '../../host/link/probe-report.ts';
import { parseSimpleRig } from '../../protocol/rig.ts';
import { DeviceLines } from './helpers/device-lines.ts';
import { FakeBinding } from './helpers/fake-binding.ts';
import { ManualTime, settle } from './helpers/manual-time.ts';

describe('probe', () => {
  it('reports the hello, the reply to ?, heartbeat intervals from arrival times, errors and levels', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    let t = 0;
    const m = new ManualTime();
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, now: () => t, timers: m.timers, helloNudgeMs: 5 });
    // Heartbeats 1000, 1010, 990, 1000 ms apart on the host clock; one damaged line; gate 0 high.
    const gaps = [1000, 1010, 990, 1000];
    let ticks = 0;
    const sleep = async (): Promise<void> => {
      for (const [i, g] of [0, ...gaps].entries()) {
        t += g * 1000;
        ticks += 16_000_000;
        b.port('/dev/ttyX').emit(`${d.beat(ticks, 0b01)}\n${i === 2 ? 'T 9 zz *00\n' : ''}`);
        await settle();
      }
    };
    const probing = probeBoard({ link, seconds: 5, now: () => t, sleep });
    await m.advance(5);
    const r = await probing;
    await link.close();
    expect(r.helloReplyMs).not.toBeNull();
    expect(r.heartbeats).toBe(5);
    expect(r.intervalMs!.mean).toBeCloseTo(1000, 6);
    expect(r.intervalMs!.min).toBe(990);
    expect(r.intervalMs!.max).toBe(1010);
    // Sample SD of 1000, 1010, 990, 1000: sqrt(200/3).
    expect(r.intervalMs!.sd).toBeCloseTo(Math.sqrt(200 / 3), 9);
    expect(r.deviceIntervalMs).toBeCloseTo(1000, 9);
    expect(r.lineErrors).toBe(1);
    expect(r.problems).toEqual(['1 of 7 lines rejected (noise on the cable, or a wrong baud)']);
    const rig = parseSimpleRig({ length_m: 1, flag_width_m: 0.02, blocked_level: 'low', channel: 0 });
    if (!rig.ok) throw new Error(rig.error);
    expect(formatProbe(r, rig.rig).join('\n')).toMatch(/gates {6}ch0 high \(beam clear\), ch1 low/);
  });

  it('a blocked beam reads BLOCKED for the rig channel only', () => {
    const rig = parseSimpleRig({ length_m: 1, flag_width_m: 0.02, blocked_level: 'high', channel: 1 });
    if (!rig.ok) throw new Error(rig.error);
    expect(describeLevels(0b10, 2, rig.rig)).toEqual(['ch0 low', 'ch1 high (beam BLOCKED)']);
    expect(describeLevels(0b10, 2)).toEqual(['ch0 low', 'ch1 high']);
  });

  it('no heartbeats at all is a problem', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const m = new ManualTime();
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, timers: m.timers, helloNudgeMs: 5, heartbeatMs: 60_000 });
    const probing = probeBoard({ link, seconds: 0.05, now: () => 0, sleep: (ms) => m.advance(ms) });
    await m.advance(5);
    const r = await probing;
    await link.close();
    expect(r.problems.join()).toMatch(/no heartbeat in 0.05 s/);
  });
});
