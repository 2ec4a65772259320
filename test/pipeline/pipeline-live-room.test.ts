// The room in the live state: the sensor's state from its S records and the latest A reading, as the journal carries them.
import { describe, expect, it } from 'vitest';
import { decodeLine } from '../../protocol/decode.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { parseJournalLine, type JournalEntry } from '../../protocol/journal.ts';
import { SENSOR_FAULTS, type DeviceRecord } from '../../protocol/records.ts';
import { createRunPipeline } from '../../host/pipeline/run-pipeline.ts';
import { loadScenario, parseScenario, simulateJournal } from '../../sim/index.ts';

const withRoom = parseScenario({ ...JSON.parse(JSON.stringify(loadScenario('demo-low-q'))), room: {} });
const entriesOf = (sc = withRoom): JournalEntry[] => [...simulateJournal(sc, { seed: 2, durationS: 120 }).lines].map(parseJournalLine);
type Data = Extract<JournalEntry, { kind: 'data' }>;
const records = (es: readonly JournalEntry[]): { e: Data; r: DeviceRecord }[] =>
  es.flatMap((e) => {
    if (e.kind !== 'data') return [];
    const d = decodeLine(e.line);
    return d.ok ? [{ e, r: d.record }] : [];
  });

describe('the live room', () => {
  it('is null for a run without a room sensor', () => {
    const p = createRunPipeline();
    for (const e of entriesOf(loadScenario('demo-low-q'))) p.push(e);
    expect(p.live().room).toBeNull();
  });

  it('the latest A reading as sent, when it arrived, and the S state that came after the hello', () => {
    const es = entriesOf();
    const p = createRunPipeline();
    for (const e of es) p.push(e);
    const rec = records(es);
    const lastA = rec.filter((x) => x.r.kind === 'A').at(-1)!;
    const a = lastA.r as Extract<DeviceRecord, { kind: 'A' }>;
    expect(rec.filter((x) => x.r.kind === 'A').length).toBeGreaterThan(10);
    const room = p.live().room!;
    expect(room.sensorState).toBe(0);
    expect(room.reading).toMatchObject({ tempC: a.temp / 100, pressPa: a.press, rhPct: a.hum / 1000, host_s: lastA.e.hostUs / 1e6 });
    // The spacing of the last two arrivals: the simulated board's 10 s interval, within the link's latency.
    const [prevA] = rec.filter((x) => x.r.kind === 'A').slice(-2);
    expect(room.spacing_s).toBe((lastA.e.hostUs - prevA!.e.hostUs) / 1e6);
    expect(Math.abs(room.spacing_s! - 10)).toBeLessThan(0.05);
  });

  it('a fault keeps the last reading; a new reading at 20 °C, 101325 Pa, 50 %RH gives 1.19931 kg/m³; a new hello clears the state', () => {
    const es = entriesOf();
    const p = createRunPipeline();
    for (const e of es) p.push(e);
    const rec = records(es);
    const last = rec.at(-1)!;
    const beat = rec.filter((x) => x.r.kind === 'T').at(-1)!.r as Extract<DeviceRecord, { kind: 'T' }>;
    let seq = last.r.seq;
    let hostUs = last.e.hostUs;
    const send = (r: DeviceRecord): void => p.push({ kind: 'data', hostUs: (hostUs += 1000), line: encodeRecord({ ...r, seq: ++seq % 0x10000 }) });
    const { reading: before, spacing_s } = p.live().room!;
    send({ kind: 'S', seq: 0, state: SENSOR_FAULTS.absent });
    expect(p.live().room).toEqual({ sensorState: SENSOR_FAULTS.absent, reading: before, spacing_s });
    send({ kind: 'S', seq: 0, state: 0 });
    send({ kind: 'A', seq: 0, ticks: beat.ticks + 1000, temp: 2000, press: 101325, hum: 50000 });
    const now = p.live().room!;
    expect(now.sensorState).toBe(0);
    // docs/references.md#ref-air-density: CIPM-2007 at 20 °C, 101325 Pa, 50 %RH, x_CO2 0.0004.
    expect(now.reading!.airDensity_kg_m3).toBeCloseTo(1.19931, 4);
    expect(now.reading!.host_s).toBe(hostUs / 1e6);
    const hello = rec.find((x) => x.r.kind === 'H')!.r;
    send(hello);
    expect(p.live().room!.sensorState).toBeNull();
    expect(p.live().room!.reading!.tempC).toBe(20);
  });
});
