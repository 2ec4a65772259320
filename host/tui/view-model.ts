// The live screen as data: every label, value and warning formatted from one snapshot (pure, no React).
import type { AnalysisResult } from '../analysis/result.ts';
import type { LiveClock, LiveState } from '../pipeline/live-state.ts';
import type { Rig } from '../../protocol/rig.ts';
import { periodRatio } from '../analysis/elliptic.ts';
import { lossRate } from '../analysis/damping.ts';
import { expectsLines, type FeedStatus } from './feed.ts';
import { formatBytes, formatDuration, formatFixed, formatSpeed, formatWithU } from './format.ts';
import { gateNote } from '../output/gate-words.ts';
import { warningsFor, type ViewWarning } from './warnings.ts';
import { planeView, type PlaneView } from './view-plane.ts';
import { roomLine, type RoomLine } from './view-room.ts';

/** Everything the screen is drawn from. */
export interface ViewInput {
  readonly feed: FeedStatus;
  readonly live: LiveState;
  readonly result: AnalysisResult;
  readonly rig: Rig | null;
  /** Host seconds now on the run's time base (the last line's time, advanced by the wall clock while lines are due). */
  readonly now_s: number;
  /** Host seconds of the first line since the estimates were last restarted. */
  readonly since_s: number;
  readonly heartbeatInterval_s: number | null;
  /** Host seconds at which the estimates were restarted, or null. */
  readonly restartedAt_s: number | null;
  readonly paused: boolean;
}

/** How a value should stand out. */
export type Tone = 'normal' | 'good' | 'bad' | 'muted' | 'accent';

export interface StatusItem {
  readonly label: string;
  readonly value: string;
  readonly tone: Tone;
  /** First status line (where from, device) or second (link, clock, time, journal). */
  readonly line: 1 | 2;
  /** A path that may lose its beginning when the line is too narrow. */
  readonly shrink?: boolean;
  /** A shorter wording for a narrow line. */
  readonly short?: string;
  /** Dropped before the other items when the line is still too narrow. */
  readonly dropFirst?: boolean;
}

export interface NumberRow {
  readonly label: string;
  readonly value: string;
  readonly unit: string;
  readonly note?: string;
  readonly tone: Tone;
}

export interface HealthItem {
  readonly label: string;
  readonly count: number;
}

export interface PlotData {
  readonly xs: number[];
  readonly ys: number[];
}

export interface ViewModel {
  readonly title: string;
  readonly status: readonly StatusItem[];
  readonly numbers: readonly NumberRow[];
  readonly health: readonly HealthItem[];
  readonly warnings: readonly ViewWarning[];
  /** Measured periods (s) against amplitude (°), and the exact law through T0. */
  readonly periodPoints: PlotData;
  readonly periodCurve: PlotData;
  /** Amplitude (°) against time (min), and the fitted decay. */
  readonly amplitudePoints: PlotData;
  readonly amplitudeCurve: PlotData;
  /** Two-beam runs: the swing plane's figures and top view; null for one beam. */
  readonly plane: PlaneView | null;
  /** The room sensor's line; null when the run has none. */
  readonly room: RoomLine | null;
}

const STANDARD_G = 9.80665;
const RAD = Math.PI / 180;

function connectionItem(feed: FeedStatus): StatusItem {
  const c = feed.connection;
  switch (c.kind) {
    case 'simulated':
      return { label: 'link', value: 'simulated', tone: 'good', line: 2 };
    case 'opening':
      return { label: 'link', value: 'opening port', tone: 'accent', line: 2 };
    case 'waiting-hello':
      return { label: 'link', value: 'waiting for hello', tone: 'accent', line: 2 };
    case 'connected':
      return { label: 'link', value: 'connected', tone: 'good', line: 2 };
    case 'reconnecting':
      return { label: 'link', value: `reconnecting (try ${c.retries})`, tone: 'bad', line: 2 };
    case 'following':
      return { label: 'mode', value: 'following the file', tone: 'good', line: 2 };
    case 'replaying':
      return { label: 'mode', value: 'replaying', tone: 'good', line: 2 };
    case 'ended':
      return { label: feed.sourceKind === 'watch' ? 'mode' : 'link', value: `ended: ${c.why}`, ...(c.short ? { short: c.short } : {}), tone: 'muted', line: 2 };
    case 'not-written':
      return { label: 'mode', value: c.why, short: c.short, tone: 'muted', line: 2 };
  }
}

/** The period to expect next: T0, else the last period, else one from the rig's length at standard gravity. */
export function expectedPeriod(live: LiveState, result: AnalysisResult, rig: Rig | null): number | null {
  if (result.T0_s !== null) return result.T0_s;
  if (live.periodS !== null) return live.periodS;
  return rig ? 2 * Math.PI * Math.sqrt(rig.length_m / STANDARD_G) : null;
}

/** The fitted loss law dA/dt = −rate(A) integrated from (t0, A0) with RK4 on the plot's own grid; time in minutes. */
export function decayCurve(fit: { a0: number; a1: number; a2: number }, t0_s: number, a0_deg: number, t1_s: number, steps = 120): PlotData {
  const xs: number[] = [];
  const ys: number[] = [];
  const f = (a: number): number => -lossRate(fit, a);
  let a = a0_deg * RAD;
  const h = (t1_s - t0_s) / steps;
  for (let i = 0; i <= steps; i++) {
    xs.push((t0_s + i * h) / 60);
    ys.push(a / RAD);
    const k1 = f(a);
    const k2 = f(a + (h / 2) * k1);
    const k3 = f(a + (h / 2) * k2);
    const k4 = f(a + h * k3);
    a = Math.max(0, a + (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4));
  }
  return { xs, ys };
}

/** The plots from the analysis result's own series (clock-corrected, as `analyze` and the report draw them). */
function plots(result: AnalysisResult): Pick<ViewModel, 'periodPoints' | 'periodCurve' | 'amplitudePoints' | 'amplitudeCurve'> {
  const pva = result.plots.periodVsAmplitude;
  const avt = result.plots.amplitudeVsTime;
  const periodPoints: PlotData = { xs: [...pva.amplitude_deg], ys: [...pva.period_s] };
  const amplitudePoints: PlotData = { xs: avt.t_s.map((t) => t / 60), ys: [...avt.amplitude_deg] };
  const periodCurve: PlotData = { xs: [], ys: [] };
  if (result.T0_s !== null && periodPoints.xs.length > 0) {
    const top = Math.max(...periodPoints.xs) * 1.05;
    for (let i = 0; i <= 60; i++) {
      const a = (top * i) / 60;
      periodCurve.xs.push(a);
      periodCurve.ys.push(result.T0_s * periodRatio(a * RAD));
    }
  }
  const fit = result.damping_fits.find((d) => d.model === result.damping_model);
  const n = avt.t_s.length;
  const amplitudeCurve = fit && n > 1 ? decayCurve(fit, avt.t_s[0]!, avt.amplitude_deg[0]!, avt.t_s[n - 1]!) : { xs: [], ys: [] };
  return { periodPoints, periodCurve, amplitudePoints, amplitudeCurve };
}

/**
 * The clock the figures are timed with: nominal with its uncertainty and when the host-clock fit will take over,
 * or the fitted rate and since when (the live g jumps there).
 */
function clockItem(c: LiveClock): StatusItem {
  const from = c.hostCalibrationFrom_s !== null ? formatDuration(c.hostCalibrationFrom_s) : null;
  const value =
    c.source === 'nominal'
      ? `nominal (±${formatFixed(c.u_ppm, 0)} ppm)${from ? `, host fit at ${from}` : ''}`
      : `${formatWithU(c.ppm, c.u_ppm, 1).replace(/^(?=\d)/, '+')} ppm (${c.source}${c.source === 'host' && from ? ` since ${from}` : ''})`;
  // On a narrow line the clock keeps its rate and u, and gives way before the run time does.
  const short = c.source === 'nominal' ? `nominal (±${formatFixed(c.u_ppm, 0)} ppm)` : `${formatWithU(c.ppm, c.u_ppm, 1).replace(/^(?=\d)/, '+')} ppm`;
  return { label: 'clock', value, short, dropFirst: true, tone: c.source === 'nominal' ? 'muted' : 'normal', line: 2 };
}

/** The status bar: source, speed, device, connection (line 1); clock, run time, estimates, journal (line 2). */
function statusItems(input: ViewInput): StatusItem[] {
  const { feed, live, result } = input;
  const hello = live.hello;
  const watching = feed.sourceKind === 'watch';
  const source = watching && feed.journal ? `${feed.sourceLabel} (${formatBytes(feed.journal.bytes)})` : feed.sourceLabel;
  const status: StatusItem[] = [
    { label: feed.sourceKind === 'demo' ? 'scenario' : feed.sourceKind === 'live' ? 'port' : 'journal', value: source, tone: 'accent', line: 1, shrink: true },
  ];
  if (feed.speed !== null) status.push({ label: 'speed', value: formatSpeed(feed.speed), tone: feed.speed === 1 ? 'normal' : 'accent', line: 1 });
  if (hello) status.push({ label: 'fw', value: hello.fw, tone: 'normal', line: 1 }, { label: 'protocol', value: String(hello.proto), tone: 'normal', line: 1 });
  else status.push({ label: 'device', value: 'no hello yet', tone: 'muted', line: 1 });
  status.push(connectionItem(feed));
  status.push(clockItem(live.clock));
  status.push({ label: 'run', value: formatDuration(input.now_s), tone: 'normal', line: 2 });
  if (input.restartedAt_s !== null) status.push({ label: 'estimates since', value: formatDuration(input.restartedAt_s), tone: 'accent', line: 2 });
  if (!watching)
    status.push(
      feed.journal
        ? { label: 'journal', value: `${feed.journal.path} (${formatBytes(feed.journal.bytes)})`, tone: 'normal', line: 2, shrink: true }
        : { label: 'journal', value: 'none', tone: 'muted', line: 2 },
    );

  return status;
}

/** The coverage label of a value shown with its standard uncertainty (as the summary and the report label it). */
function coverage(v: number | null, u: number | null): string | undefined {
  return v !== null && u !== null && u > 0 && Number.isFinite(u) ? 'k = 1' : undefined;
}

const joinNotes = (...notes: (string | undefined)[]): string | undefined => notes.filter(Boolean).join('; ') || undefined;

/** The numbers panel: the live swing, then the full result's T0, g, local g, Q, gate offset and passes. */
function numberRows(live: ViewInput['live'], result: ViewInput['result']): NumberRow[] {
  const [h1, h2] = live.halfPeriodsS;
  const expected = result.expected_g_m_s2;
  const numbers: NumberRow[] = [
    { label: 'half-periods', value: `${formatFixed(h1, 5)}  ${formatFixed(h2, 5)}`, unit: 's', tone: 'normal' },
    { label: 'period', value: formatFixed(live.periodS, 5), unit: 's', tone: 'normal' },
    { label: 'amplitude', value: formatFixed(live.amplitudeDeg, 2), unit: '°', tone: 'normal' },
    { label: 'T0', value: formatWithU(result.T0_s, result.T0_u_s, 5), unit: 's', note: coverage(result.T0_s, result.T0_u_s), tone: result.T0_s !== null ? 'accent' : 'muted' },
    {
      label: 'g',
      value: formatWithU(result.g_m_s2, result.g_u_m_s2, 4),
      unit: 'm/s²',
      // Until the host-clock fit starts, g carries the nominal clock's ±2887 ppm, and it moves when the fit starts.
      note: joinNotes(
        coverage(result.g_m_s2, result.g_u_m_s2),
        result.clock_source === 'nominal' && live.clock.source === 'nominal' && live.clock.hostCalibrationFrom_s !== null ? `nominal clock until ${formatDuration(live.clock.hostCalibrationFrom_s)}` : undefined,
      ),
      tone: result.g_m_s2 !== null ? 'accent' : 'muted',
    },
  ];
  if (expected !== null)
    numbers.push({
      label: 'local g',
      value: formatFixed(expected, 4),
      unit: 'm/s²',
      note: result.g_diff_sigma !== null ? `${formatFixed(result.g_diff_sigma, 1, true)}σ` : undefined,
      tone: result.g_diff_sigma !== null && Math.abs(result.g_diff_sigma) > 2 ? 'bad' : 'normal',
    });
  // Q changes with the amplitude (a quadratic or mixed loss law): it is quoted at the run's median amplitude.
  const qAt = result.Q !== null && result.median_amplitude_deg !== null ? `at ${formatFixed(result.median_amplitude_deg, 1)}°` : undefined;
  numbers.push({ label: 'Q', value: formatWithU(result.Q, result.Q_u, 0), unit: '', note: qAt, tone: 'normal' });
  numbers.push({
    label: 'gate offset',
    value:
      result.gate_offset_m === null ? '—' : result.gate_offset_side === 'release' ? formatFixed(result.gate_offset_m * 1000, 1, true) : formatFixed(Math.abs(result.gate_offset_m) * 1000, 1),
    unit: 'mm',
    note: gateNote(result.gate_offset_m, result.gate_offset_u_m, result.gate_offset_side),
    tone: 'normal',
  });
  // The analysis' count of valid passes (what `analyze` reports); the live count only until the first result has any.
  numbers.push({ label: 'passes', value: String(result.passes > 0 ? result.passes : live.passes), unit: '', tone: 'normal' });

  return numbers;
}

/** Builds the screen's data from a snapshot. */
export function buildViewModel(input: ViewInput): ViewModel {
  const { feed, live, result, rig } = input;
  const status = statusItems(input);
  const numbers = numberRows(live, result);

  // Link and device counts come fresh from the live state; pass rejections only from the full analysis.
  const c = live.counts;
  const health: HealthItem[] = [
    { label: 'line errors', count: c.crc_errors + c.bad_lines },
    { label: 'lost', count: c.lines_lost },
    { label: 'drops', count: c.device_lost },
    { label: 'rejected', count: result.counts.rejected_passes },
    { label: 'reboots', count: c.reboots },
    { label: 'disconnects', count: c.disconnects },
  ];

  const lastPass = live.recent.t_s.length ? live.recent.t_s[live.recent.t_s.length - 1]! : null;
  const warnings = warningsFor({
    now_s: input.now_s,
    lastPass_s: lastPass,
    since_s: input.since_s,
    expectedPeriod_s: expectedPeriod(live, result, rig),
    lastHeartbeat_s: live.heartbeatAgeS !== null && live.lastHostUs !== null ? live.lastHostUs / 1e6 - live.heartbeatAgeS : null,
    heartbeatInterval_s: input.heartbeatInterval_s,
    expectingLines: expectsLines(feed.connection),
    disconnected: feed.connection.kind === 'reconnecting',
    // A bob still passing through without clearing the beam (the newest pass left out) is not resting in it.
    blocked: live.blocked && live.lastPass?.status !== 'unsequenced',
    lastAmplitude_deg: live.amplitudeDeg,
    beamHalfAngle_deg: rig ? Math.asin(Math.min(1, rig.flag_width_m / 2 / rig.length_m)) / RAD : null,
    length_m: rig?.length_m ?? null,
    flagWidth_m: rig?.flag_width_m ?? null,
    room: live.room?.reading && live.room.sensorState === 0 ? { lastReading_s: live.room.reading.host_s, spacing_s: live.room.spacing_s } : null,
    analysis: result.warnings,
  });

  return {
    title: `halfswing ${feed.sourceKind}${input.paused ? ' · display paused' : ''}`,
    status,
    numbers,
    health,
    warnings,
    ...plots(result),
    plane: planeView(live.plane, result, rig),
    room: roomLine(live.room, input.now_s, warnings.some((x) => x.kind === 'room-reading-stale')),
  };
}
