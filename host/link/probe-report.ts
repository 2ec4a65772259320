// What `halfswing probe` measures on a connected board: hello, reply to `?`, heartbeat regularity, line errors, levels.
import { decodeLine } from '../../protocol/decode.ts';
import type { HelloRecord } from '../../protocol/records.ts';
import type { AnyRig } from '../../protocol/rig.ts';
import { SequenceTracker } from '../../protocol/sequence.ts';
import type { DeviceLink } from './device-link.ts';

export interface ProbeReport {
  readonly port: string;
  readonly hello: HelloRecord;
  /** ms from sending `?` to the hello that answered it; null when none came. */
  readonly helloReplyMs: number | null;
  readonly seconds: number;
  readonly heartbeats: number;
  readonly expectedHeartbeatMs: number;
  /** Host-side intervals between heartbeats (arrival of their LF), ms. */
  readonly intervalMs: { readonly mean: number; readonly sd: number; readonly min: number; readonly max: number } | null;
  /** Device-side mean heartbeat interval from the ticks, ms at the nominal clock. */
  readonly deviceIntervalMs: number | null;
  readonly lines: number;
  readonly lineErrors: number;
  readonly linesLost: number;
  /** Edges the device says it dropped since boot (last heartbeat). */
  readonly deviceLost: number | null;
  readonly levels: number | null;
  readonly problems: readonly string[];
}

export interface ProbeOptions {
  readonly link: DeviceLink;
  readonly seconds: number;
  readonly now: () => number;
  /** Resolves after ms (injected so tests need not wait on wall time they do not control). */
  readonly sleep?: (ms: number) => Promise<void>;
}

const sleepMs = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** Probes a link that has said hello: asks `?`, then listens for `seconds`. */
export async function probeBoard(o: ProbeOptions): Promise<ProbeReport> {
  const sleep = o.sleep ?? sleepMs;
  const hello = await o.link.ready;
  const beatsUs: number[] = [];
  const beatTicks: number[] = [];
  let lines = 0;
  let errors = 0;
  let levels: number | null = null;
  let deviceLost: number | null = null;
  let askedAt: number | undefined;
  let replyMs: number | null = null;
  const tracker = new SequenceTracker();
  o.link.onEvent((e) => {
    if (e.type !== 'line') return;
    lines++;
    const d = decodeLine(e.line);
    if (!d.ok) {
      errors++;
      return;
    }
    tracker.push(d.record);
    const r = d.record;
    if (r.kind === 'H' && askedAt !== undefined && replyMs === null) replyMs = (e.hostUs - askedAt) / 1000;
    if (r.kind === 'T') {
      beatsUs.push(e.hostUs);
      beatTicks.push(r.ticks);
      levels = r.levels;
      deviceLost = r.lost;
    }
  });
  askedAt = o.now();
  await o.link.send('?');
  await sleep(o.seconds * 1000);
  const expected = o.link.stats().heartbeatMs;
  const iv = beatsUs.slice(1).map((t, i) => (t - beatsUs[i]!) / 1000);
  const mean = iv.length ? iv.reduce((a, b) => a + b, 0) / iv.length : 0;
  const sd = iv.length > 1 ? Math.sqrt(iv.reduce((a, b) => a + (b - mean) ** 2, 0) / (iv.length - 1)) : 0;
  const devIv = beatTicks.length > 1 ? ((beatTicks.at(-1)! - beatTicks[0]!) / (beatTicks.length - 1) / hello.hz) * 1000 : null;
  const problems: string[] = [];
  if (replyMs === null) problems.push("no hello in reply to '?'");
  if (beatsUs.length === 0) problems.push(`no heartbeat in ${o.seconds} s (expected one every ${expected} ms)`);
  else if (iv.length && Math.abs(mean - expected) > 0.05 * expected)
    problems.push(`heartbeats every ${mean.toFixed(0)} ms, expected ${expected} ms`);
  if (errors > 0) problems.push(`${errors} of ${lines} lines rejected (noise on the cable, or a wrong baud)`);
  const lost = tracker.totals().linesLost;
  if (lost > 0) problems.push(`${lost} lines missing by sequence number`);
  if (deviceLost) problems.push(`the device dropped ${deviceLost} edges since boot`);
  return {
    port: o.link.path() ?? '?',
    hello,
    helloReplyMs: replyMs,
    seconds: o.seconds,
    heartbeats: beatsUs.length,
    expectedHeartbeatMs: expected,
    intervalMs: iv.length ? { mean, sd, min: Math.min(...iv), max: Math.max(...iv) } : null,
    deviceIntervalMs: devIv,
    lines,
    lineErrors: errors,
    linesLost: lost,
    deviceLost,
    levels,
    problems,
  };
}

/** "ch0 high (beam clear)" per channel, using the rig's blocked level when given. */
export function describeLevels(levels: number, channels: number, rig?: AnyRig): string[] {
  const out: string[] = [];
  for (let ch = 0; ch < channels; ch++) {
    const high = ((levels >> ch) & 1) === 1;
    let beam = '';
    if (rig && rig.beams.some((b) => b.channel === ch)) beam = ` (beam ${high === (rig.blocked_level === 'high') ? 'BLOCKED' : 'clear'})`;
    out.push(`ch${ch} ${high ? 'high' : 'low'}${beam}`);
  }
  return out;
}

/** The probe report as text lines. */
export function formatProbe(r: ProbeReport, rig?: AnyRig): string[] {
  const h = r.hello;
  const f = (v: number): string => v.toFixed(1);
  const out = [
    `port       ${r.port}`,
    `firmware   halfswing ${h.fw} on ${h.mcu}, protocol ${h.proto}, boot ${h.boot.toString(16).padStart(4, '0')}`,
    `clock      ${h.hz} Hz nominal`,
    `channels   ${h.ch}`,
    `'?' reply  ${r.helloReplyMs === null ? 'none' : `${f(r.helloReplyMs)} ms`}`,
    `heartbeats ${r.heartbeats} in ${r.seconds} s` +
      (r.intervalMs ? `: every ${f(r.intervalMs.mean)} ms (sd ${f(r.intervalMs.sd)}, ${f(r.intervalMs.min)}–${f(r.intervalMs.max)}), expected ${r.expectedHeartbeatMs}` : ''),
    `lines      ${r.lines}, rejected ${r.lineErrors} (${r.lines ? ((100 * r.lineErrors) / r.lines).toFixed(2) : '0.00'} %), missing ${r.linesLost}`,
    `gates      ${r.levels === null ? 'unknown (no heartbeat)' : describeLevels(r.levels, h.ch, rig).join(', ')}`,
  ];
  out.push(r.problems.length ? `problems   ${r.problems.join('; ')}` : 'verdict    looks healthy');
  return out;
}
