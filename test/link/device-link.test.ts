import { MockBinding } from '@serialport/binding-mock';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { BindingInterface, BindingOpenOptions } from '../../host/link/binding-types.ts';
import { openDeviceLink, type DeviceLink, type DeviceLinkOptions, type LinkEvent } from '../../host/link/device-link.ts';
import { encodeRecord } from '../../protocol/encode.ts';
import { DeviceLines } from './helpers/device-lines.ts';
import { FakeBinding } from './helpers/fake-binding.ts';
import { ManualTime, settle, until } from './helpers/manual-time.ts';

/** Collects events until `stop` matches (or the link closes). */
async function collect(link: DeviceLink, stop: (all: LinkEvent[]) => boolean): Promise<LinkEvent[]> {
  const all: LinkEvent[] = [];
  for await (const e of link) {
    all.push(e);
    if (stop(all)) break;
  }
  return all;
}

const states = (evs: LinkEvent[]): string[] => evs.flatMap((e) => (e.type === 'state' ? [e.state] : []));
const lines = (evs: LinkEvent[]): string[] => evs.flatMap((e) => (e.type === 'line' ? [e.line] : []));
const notes = (evs: LinkEvent[]): string[] => evs.flatMap((e) => (e.type === 'annotation' ? [e.word] : []));

/** The ESM MockBinding handed to the link as is (SerialPortMock.binding would be the CJS copy: another registry). */
type MockPort = { emitData(d: Buffer | string): void; recording: Buffer; isOpen: boolean };
function capturingMock(): { binding: BindingInterface; port: () => MockPort | undefined } {
  let last: MockPort | undefined;
  const binding = {
    list: () => MockBinding.list(),
    open: async (o: BindingOpenOptions) => {
      const p = await MockBinding.open(o);
      last = p as unknown as MockPort;
      return p;
    },
  } as unknown as BindingInterface;
  return { binding, port: () => last };
}

describe('device link on @serialport/binding-mock', () => {
  const dev = new DeviceLines();
  const boot = ['\x00\xf0 bootloader noise', dev.hello(), dev.beat(16e6), dev.edge(17e6, 'f')];
  beforeEach(() => MockBinding.createPort('/dev/ttyMOCK0', { echo: false, record: true, readyData: Buffer.from(boot.map((l) => `${l}\r\n`).join(''), 'latin1') }));
  afterEach(() => MockBinding.reset());

  it('waits for the hello, passes every line (CR stripped) stamped with the injected clock, and resolves ready', async () => {
    let t = 0;
    const { binding } = capturingMock();
    const link = openDeviceLink({ port: '/dev/ttyMOCK0', binding, now: () => (t += 10) });
    const evs = await collect(link, (all) => lines(all).length === boot.length);
    const hello = await link.ready;
    expect(hello.fw).toBe('1.0.0');
    expect(lines(evs)).toEqual(boot);
    expect(states(evs)).toEqual(['opening', 'waiting-hello', 'connected']);
    // The connect annotation comes just before the hello line, at its arrival time.
    const kinds = evs.flatMap((e) => (e.type === 'line' ? [e.line.slice(0, 1)] : e.type === 'annotation' ? [e.word] : []));
    expect(kinds.indexOf('connect')).toBe(kinds.indexOf('H') - 1);
    const stamps = evs.flatMap((e) => (e.type === 'line' ? [e.hostUs] : []));
    // All four lines arrived in one chunk: one arrival time for all.
    expect(new Set(stamps).size).toBe(1);
    expect(link.stats()).toMatchObject({ lines: 4, validLines: 3, lineErrors: 1 });
    await link.close();
  });

  it('opens with hupcl on by default, and off when asked (DTR stays up at close, so a re-open does not reset)', async () => {
    const seen: (boolean | undefined)[] = [];
    const binding = {
      list: () => MockBinding.list(),
      open: async (o: BindingOpenOptions) => {
        seen.push(o.hupcl);
        return MockBinding.open(o);
      },
    } as unknown as BindingInterface;
    for (const hupcl of [undefined, false]) {
      const link = openDeviceLink({ port: '/dev/ttyMOCK0', binding, ...(hupcl === undefined ? {} : { hupcl }) });
      await link.ready;
      await link.close();
    }
    expect(seen).toEqual([true, false]);
  });

  it('sends commands as LF-terminated lines', async () => {
    const { binding, port } = capturingMock();
    const link = openDeviceLink({ port: '/dev/ttyMOCK0', binding });
    await link.ready;
    await link.send('P 500');
    expect(port()!.recording.toString('latin1')).toBe('P 500\n');
    await link.close();
  });

  it('learns a new heartbeat period from the P reply', async () => {
    const { binding, port } = capturingMock();
    const link = openDeviceLink({ port: '/dev/ttyMOCK0', binding });
    await link.ready;
    port()!.emitData(`${dev.reply('P', ['ms=250'])}\n`);
    await until(() => link.stats().heartbeatMs === 250, 'P reply');
    await link.close();
  });
});

describe('device link: hello timeout tells what the far end did', () => {
  const cases: [string, string | Buffer, RegExp][] = [
    ['silence', '', /no data from \/dev\/ttyX in 0\.2 s: wrong port/],
    ['wrong baud: bytes with no line structure', Buffer.from(Array.from({ length: 300 }, (_, i) => (i * 37 + 11) & 0xfe | 0x80)), /not text lines at 250000 baud: probably the wrong baud/],
    ['another program', 'Temperature: 21.5 C\r\nTemperature: 21.6 C\r\n', /speaks something else: 2 lines .*"Temperature: 21.5 C"/],
  ];
  for (const [name, bytes, want] of cases) {
    it(name, async () => {
      const b = new FakeBinding();
      b.add('/dev/ttyX');
      const m = new ManualTime();
      const link = openDeviceLink({ port: '/dev/ttyX', binding: b, helloTimeoutMs: 200, helloNudgeMs: 50, now: m.nowUs, timers: m.timers });
      await until(() => b.isOpen('/dev/ttyX'), 'open');
      if (bytes.length > 0) b.port('/dev/ttyX').emit(bytes);
      await m.advance(199);
      expect(b.isOpen('/dev/ttyX')).toBe(true);
      await m.advance(1);
      await expect(link.ready).rejects.toThrow(want);
      expect(b.isOpen('/dev/ttyX')).toBe(false);
    });
  }

  it('asks with ? when the board was not reset by the open, and connects on the reply', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const m = new ManualTime();
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, helloTimeoutMs: 2000, helloNudgeMs: 30, now: m.nowUs, timers: m.timers });
    await until(() => b.isOpen('/dev/ttyX'), 'open');
    await m.advance(29);
    expect(b.port('/dev/ttyX').written).toBe('');
    await m.advance(1);
    expect((await link.ready).boot).toBe(d.boot);
    await link.close();
  });
});

describe('device link: a hello of another protocol version', () => {
  it('is not read as version 1: the first connection fails saying so (SPEC section 6)', async () => {
    const b = new FakeBinding();
    b.add('/dev/ttyX', {}, (cmd) =>
      cmd === '?' ? [encodeRecord({ kind: 'H', seq: 0, proto: 2, fw: '9.0.0', mcu: 'm328p', hz: 16e6, ch: 2, boot: 1, extra: {} })] : [],
    );
    const m = new ManualTime();
    const link = openDeviceLink({ port: '/dev/ttyX', binding: b, helloNudgeMs: 5, now: m.nowUs, timers: m.timers });
    await m.advance(5);
    await expect(link.ready).rejects.toThrow(/speaks protocol 2; this halfswing reads protocol 1: update halfswing/);
    expect(b.isOpen('/dev/ttyX')).toBe(false);
  });
});

describe('device link: open failures become one clear line', () => {
  it('a missing port', async () => {
    const b = new FakeBinding();
    await expect(openDeviceLink({ port: '/dev/ttyNOPE', binding: b }).ready).rejects.toThrow(/no serial port \/dev\/ttyNOPE: check the cable/);
  });
  it('a busy port', async () => {
    const b = new FakeBinding();
    b.add('/dev/ttyX');
    b.openError = 'Error Resource temporarily unavailable Cannot lock port';
    await expect(openDeviceLink({ port: '/dev/ttyX', binding: b }).ready).rejects.toThrow(/\/dev\/ttyX is busy: another program holds it/);
  });
  it('permission denied names the group to join', async () => {
    // The message bindings-cpp 13 builds from strerror(EACCES) (src/serialport_unix.cpp).
    const b = new FakeBinding();
    b.add('/dev/ttyX');
    b.openError = 'Error: Permission denied, cannot open /dev/ttyX';
    const err = openDeviceLink({ port: '/dev/ttyX', binding: b }).ready;
    await expect(err).rejects.toThrow(process.platform === 'linux' ? /join the group .*dialout/ : /permission denied/);
  });
  it('--port auto with no board, and with two', async () => {
    await expect(openDeviceLink({ port: 'auto', binding: new FakeBinding(), sysRoot: '/nonexistent' }).ready).rejects.toThrow(/no USB serial port found/);
    const b = new FakeBinding();
    b.add('/dev/ttyACM0', { vendorId: '2341', productId: '0043' });
    b.add('/dev/ttyACM1', { vendorId: '2341', productId: '0043' });
    await expect(openDeviceLink({ port: 'auto', binding: b, sysRoot: '/nonexistent' }).ready).rejects.toThrow(/2 candidate ports .*pass one with --port/);
  });
});

describe('device link: unplug, replug and reboot (fake binding, time driven by hand)', () => {
  const fast = { helloTimeoutMs: 500, helloNudgeMs: 20, heartbeatMs: 40, backoffMs: { first: 10, max: 40 }, sysRoot: '/nonexistent' };

  /** A link on a hand-moved clock, recording every event; connected once `m` has reached the first nudge. */
  async function linked(b: FakeBinding, port: string, extra: Partial<DeviceLinkOptions> = {}) {
    const m = new ManualTime();
    const link = openDeviceLink({ port, binding: b, ...fast, now: m.nowUs, timers: m.timers, ...extra });
    const all: LinkEvent[] = [];
    link.onEvent((e) => all.push(e));
    await m.advanceUntil(() => states(all).includes('connected'), 'first connect');
    await link.ready;
    return { m, link, all };
  }

  /** A fake board at /dev/ttyX that answers '?', a link to it recording every event, connected. */
  async function connected(extra: Partial<DeviceLinkOptions> = {}) {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyX', {}, (cmd) => (cmd === '?' ? [d.hello()] : []));
    return { b, d, ...(await linked(b, '/dev/ttyX', extra)) };
  }

  it('journals one disconnect and one connect, and finds the board under its new path by serial number', async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    const answer = (cmd: string): string[] => (cmd === '?' ? [d.hello()] : []);
    b.add('/dev/ttyACM0', { serialNumber: 'A1B2C3', vendorId: '2341', productId: '0043' }, answer);
    const { m, link, all } = await linked(b, '/dev/ttyACM0');
    b.port('/dev/ttyACM0').emit(`${d.beat(16e6)}\n${d.edge(16.5e6, 'f')}\n`);
    await until(() => lines(all).length === 3, 'lines before unplug');
    // The identity is learnt from list() after the hello, and the stream re-arms its read: let both happen.
    await settle();
    const unplugged = b.unplug('/dev/ttyACM0');
    await until(() => states(all).includes('reconnecting'), 'reconnecting');
    // Away for 50 ms: the retries back off (10, 20, 40 ms).
    await m.advance(50);
    b.replug(unplugged, '/dev/ttyACM1');
    await m.advanceUntil(() => states(all).filter((s) => s === 'connected').length === 2, 'second connect');
    b.port('/dev/ttyACM1').emit(`${d.beat(32e6)}\n`);
    await until(() => lines(all).length === 5, 'lines after replug');
    expect(notes(all)).toEqual(['connect', 'disconnect', 'connect']);
    // Found by the failed read (the port's close event), not by the heartbeat watch: no time passed before it.
    const disc = all.find((e) => e.type === 'annotation' && e.word === 'disconnect');
    expect(disc && disc.type === 'annotation' && disc.text).toMatch(/^disconnected: ENXIO/);
    expect(link.path()).toBe('/dev/ttyACM1');
    expect(link.stats().reconnects).toBe(1);
    const delays = all.flatMap((e) => (e.type === 'state' && e.state === 'reconnecting' ? [e.delayMs] : []));
    expect(delays.slice(0, 3)).toEqual([10, 20, 40]);
    await link.close();
    // A close asked for by the host is a stop, not a lost link (#14 item 11).
    expect(notes(all).at(-1)).toBe('stop');
    expect(states(all).at(-1)).toBe('closed');
  });

  it('declares the link lost when heartbeats stop for 3 periods, and recovers', async () => {
    const { m, link, all } = await connected();
    const helloAtMs = m.nowMs;
    // No heartbeat at all after the hello: silent for > 3 × 40 ms, checked every 20 ms.
    await m.advance(120);
    expect(notes(all)).toEqual(['connect']);
    await m.advance(20);
    expect(notes(all)).toEqual(['connect', 'disconnect']);
    const disc = all.find((e) => e.type === 'annotation' && e.word === 'disconnect');
    expect(disc && disc.type === 'annotation' && disc.text).toMatch(/no heartbeat for 0\.1 s/);
    expect(disc!.hostUs).toBe((helloAtMs + 140) * 1000);
    await m.advanceUntil(() => notes(all).length === 3, 'reconnected');
    expect(notes(all)[2]).toBe('connect');
    await link.close();
  });

  it('heartbeats keep the link up however long it runs', async () => {
    const { b, d, m, link, all } = await connected();
    for (let k = 1; k <= 100; k++) {
      await m.advance(30);
      b.port('/dev/ttyX').emit(`${d.beat(k * 16e6)}\n`);
    }
    await until(() => lines(all).length === 101, 'heartbeats');
    expect(notes(all)).toEqual(['connect']);
    await link.close();
  });

  it('a reboot (new hello, new boot id) is just lines: the link stays connected', async () => {
    const { b, d, link, all } = await connected({ heartbeatMs: 1000 });
    d.reboot(0x9999);
    b.port('/dev/ttyX').emit(`${d.hello()}\n${d.beat(16e6)}\n`);
    await until(() => lines(all).length === 3, 'lines after reboot');
    expect(notes(all)).toEqual(['connect']);
    expect(states(all).filter((s) => s === 'connected')).toHaveLength(1);
    await link.close();
  });

  it('close() passes on a last line whose LF never came, if it decodes', async () => {
    const { b, d, link, all } = await connected({ heartbeatMs: 1000 });
    const before = link.stats().bytes;
    const last = d.beat(16e6);
    b.port('/dev/ttyX').emit(last);
    await until(() => link.stats().bytes === before + last.length, 'bytes');
    await link.close();
    expect(lines(all).at(-1)).toBe(last);
  });

  it('a slow consumer holds the port back instead of losing lines or queueing without bound', async () => {
    const { b, d, link } = await connected({ heartbeatMs: 60_000, highWater: 50 });
    const sent = Array.from({ length: 2000 }, (_, i) => d.edge(1000 + i, i % 2 ? 'r' : 'f'));
    b.port('/dev/ttyX').emit(sent.map((l) => `${l}\n`).join(''));
    const got: string[] = [];
    for await (const e of link) {
      if (e.type === 'line' && e.line.startsWith('E')) got.push(e.line);
      if (got.length % 100 === 0) await settle(1);
      if (got.length === sent.length) break;
    }
    expect(got).toEqual(sent);
    await link.close();
  });

  it("with --port auto, a lost board is waited for: another board attached meanwhile is not taken", async () => {
    const b = new FakeBinding();
    const d = new DeviceLines();
    b.add('/dev/ttyACM0', { serialNumber: 'MINE', vendorId: '2341', productId: '0043' }, (cmd) => (cmd === '?' ? [d.hello()] : []));
    const { m, link, all } = await linked(b, 'auto');
    await settle();
    b.unplug('/dev/ttyACM0');
    b.add('/dev/ttyACM1', { serialNumber: 'OTHER', vendorId: '2341', productId: '0043' }, (cmd) => (cmd === '?' ? [d.hello()] : []));
    await m.advanceUntil(() => states(all).filter((s) => s === 'reconnecting').length >= 3, 'retries');
    expect(b.isOpen('/dev/ttyACM1')).toBe(false);
    const why = all.flatMap((e) => (e.type === 'state' && e.state === 'reconnecting' ? [e.reason] : [])).at(-1);
    expect(why).toMatch(/the board \(serial number MINE\) is not attached/);
    await link.close();
  });
});
