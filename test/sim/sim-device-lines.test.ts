// The simulated device's lines: decodable by the codec, firmware-shaped, timed by the device's own clock.
import { describe, expect, it } from 'vitest';
import { decodeLine, parseRig, parseJournalLine, type EdgeRecord, type HelloRecord, type HeartbeatRecord } from '../../protocol/index.ts';
import { loadScenario, simulateJournal } from '../../sim/index.ts';
import { DeviceClock } from '../../sim/device-clock.ts';
import { decodeRun } from './sim-fixtures.ts';

describe('device lines of fault-free runs', () => {
  for (const name of ['club-resonator', 'brass-1m-two-hours', 'demo-low-q']) {
    it(`${name}: every data line decodes, the header is a valid journal header`, () => {
      const r = decodeRun(loadScenario(name), 5, 240);
      expect(r.rejected).toHaveLength(0);
      expect(r.records.length).toBeGreaterThan(240);
      expect(r.tracker.totals().linesLost).toBe(0);
      const head = r.text.split('\n').slice(0, 5).map(parseJournalLine);
      expect(head.map((e) => e.kind)).toEqual(['magic', 'start', 'rig', 'source', 'annotation']);
      const rig = head[2]!;
      expect(rig.kind === 'rig' && parseRig(rig.json).ok).toBe(true);
    });
  }

  it('the hello line is the firmware format with mcu=sim, within 80 bytes even at seq ffff', () => {
    const { lines } = simulateJournal(loadScenario('club-resonator'), { seed: 2, durationS: 5 });
    const data = [...lines].map(parseJournalLine).filter((e) => e.kind === 'data');
    const h = data[0]!.kind === 'data' ? data[0]!.line : '';
    expect(h).toMatch(/^H 0 halfswing proto=1 fw=\d\.\d\.\d mcu=sim hz=16000000 ch=2 boot=[0-9a-f]{4} rc=1 \*[0-9a-f]{2}$/);
    const at = h.replace(/^H 0 /, 'H ffff ');
    expect(at.length + 1).toBeLessThanOrEqual(80);
    const d = decodeLine(h);
    expect(d.ok && (d.record as HelloRecord).mcu).toBe('sim');
  });

  it('heartbeats come every 1000 ms of device time, so a +3000 ppm clock sends them 0.3 % early on the host clock', () => {
    const r = decodeRun(loadScenario('club-resonator'), 3, 600);
    const t = r.records.filter((x) => x.record.kind === 'T') as { hostUs: number; record: HeartbeatRecord }[];
    for (let i = 1; i < t.length; i++) {
      const dTicks = t[i]!.record.ticks - t[i - 1]!.record.ticks;
      // The firmware reads the counter when its main loop gets there: within the emit latency (≤ 120 µs).
      expect(Math.abs(dTicks - 16e6)).toBeLessThan(120e-6 * 16e6 * 1.01);
    }
    // club-resonator drifts +20 ppm/h as well: mean rate over 10 min is ppm 3000 + 20·(mid-run hours).
    const hostPer = (t.at(-1)!.hostUs - t[0]!.hostUs) / (t.length - 1);
    const mid = (t.at(-1)!.hostUs + t[0]!.hostUs) / 2 / 3.6e9;
    expect(Math.abs(hostPer - 1e6 / (1 + (3000 + 20 * mid) * 1e-6))).toBeLessThan(15);
  });

  it('edge ticks map back through the truth clock model to the true beam times, within sensor delay + jitter', () => {
    const r = decodeRun(loadScenario('brass-1m-two-hours'), 4, 300);
    const tr = r.truth;
    const boot = tr.clock.boots[0]!;
    const clock = new DeviceClock(tr.clock.hz, tr.clock.ppm, tr.clock.drift_ppm_per_h, boot.host_s, boot.phase_ticks);
    const e = r.records.filter((x) => x.record.kind === 'E') as { hostUs: number; record: EdgeRecord }[];
    const truthTimes = tr.passes.enter_s.flatMap((s, i) => [s, tr.passes.exit_s[i]!]).map((s) => s + tr.release_host_s);
    expect(e.length).toBe(truthTimes.length);
    let worst = 0;
    e.forEach((x, i) => {
      const blocked = x.record.edge === 'f'; // brass rig: blocked level low
      expect(blocked).toBe(i % 2 === 0);
      const delay = (blocked ? tr.gate.blocking_delay_us : tr.gate.unblocking_delay_us) * 1e-6;
      const dt = clock.timeAt(x.record.ticks - tr.clock.capture_latency_ticks + 0.5) - (truthTimes[i]! + delay);
      worst = Math.max(worst, Math.abs(dt));
      // The host stamps a line after it was sent: never before the edge, and within a few ms.
      expect(x.hostUs / 1e6).toBeGreaterThan(truthTimes[i]!);
      expect(x.hostUs / 1e6 - truthTimes[i]!).toBeLessThan(0.01);
    });
    // 5 σ of the 2 µs jitter, plus half a tick.
    expect(worst).toBeLessThan(10e-6 + 31.25e-9);
  });

  it('host receive times are integer µs, never decreasing, and quantised by 1 ms USB frames plus a tail', () => {
    const r = decodeRun(loadScenario('demo-low-q'), 6, 120);
    let last = 0;
    for (const x of r.records) {
      expect(Number.isInteger(x.hostUs)).toBe(true);
      expect(x.hostUs).toBeGreaterThanOrEqual(last);
      last = x.hostUs;
    }
  });
});
