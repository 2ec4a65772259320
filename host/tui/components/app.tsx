// The live view: subscribes to the store's snapshots, lays out the panels, and turns keys into effects.
import React, { useEffect, useReducer, useRef, useState, useSyncExternalStore } from 'react';
import { Box, Text, useInput, useStdout } from 'ink';
import type { LiveStore, StoreSnapshot } from '../live-store.ts';
import { expectsLines, type FeedStatus } from '../feed.ts';
import { INITIAL_UI, reduceKey, type KeyEffect, type UiState } from '../keys.ts';
import { layoutFor, tooSmall, tooSmallLine, type Layout } from '../layout.ts';
import type { ChartSpec } from '../plot/chart.ts';
import { buildViewModel, type ViewModel } from '../view-model.ts';
import { ChartBox } from './chart-box.tsx';
import { Footer, HealthLine, WarningLine } from './footer.tsx';
import { HelpPanel } from './help-panel.tsx';
import { NumbersPanel } from './numbers-panel.tsx';
import { PlanePanel } from './plane-panel.tsx';
import { RoomLineView } from './room-line.tsx';
import { StatusBar } from './status-bar.tsx';

export interface AppProps {
  readonly store: LiveStore;
  readonly status: () => FeedStatus;
  /** Wall clock in ms, to advance "now" between lines. */
  readonly nowMs: () => number;
  readonly onEffect: (effect: KeyEffect) => void;
  /** Keys are read only from a TTY (raw mode needs one). */
  readonly interactive: boolean;
}

/** Wall time after a line during which "now" is not advanced: a busy moment of this process is not a silent device. */
export const ARRIVAL_GRACE_MS = 500;

/** The two charts of the view: period against amplitude, and amplitude against time. */
function chartSpecs(vm: ViewModel, L: Layout): { periodChart: ChartSpec; amplitudeChart: ChartSpec } {
  const periodChart: ChartSpec = {
    width: L.plotWidth,
    height: L.chartHeight,
    x: { label: 'amplitude θ0 (°)', tickSuffix: '°', minSpan: 2 },
    y: { label: 'period T (s)  ⠂ data  ─ exact law', minSpan: 0.0005 },
    series: [
      { xs: vm.periodCurve.xs, ys: vm.periodCurve.ys, style: 'line' as const, tone: 'law' },
      { xs: vm.periodPoints.xs, ys: vm.periodPoints.ys, style: 'dots' as const, tone: 'points' },
    ],
    emptyText: 'periods appear after two swings',
  };
  const amplitudeChart: ChartSpec = {
    width: L.plotWidth,
    height: L.bodyHeight - L.chartHeight,
    x: { label: 'time (min)', minSpan: 0.5 },
    y: { label: `amplitude θ0 (°)  ⠂ data  ─ ${vm.amplitudeCurve.xs.length ? 'fitted decay' : 'fit to come'}`, minSpan: 0.5 },
    series: [
      { xs: vm.amplitudeCurve.xs, ys: vm.amplitudeCurve.ys, style: 'line' as const, tone: 'fit' },
      { xs: vm.amplitudePoints.xs, ys: vm.amplitudePoints.ys, style: 'dots' as const, tone: 'points' },
    ],
    emptyText: 'amplitudes appear after the first swing',
  };

  return { periodChart, amplitudeChart };
}

/** Host seconds now: the last line's time, advanced at the feed's speed (after a grace) while lines are still due. */
export function estimateNow(snap: StoreSnapshot, feed: FeedStatus, nowMs: number): number {
  if (snap.lastHost_s === null) return 0;
  if (!expectsLines(feed.connection) || snap.lastArrivalMs === null) return snap.lastHost_s;
  return snap.lastHost_s + (Math.max(0, nowMs - snap.lastArrivalMs - ARRIVAL_GRACE_MS) / 1000) * (feed.speed ?? 1);
}

export function App({ store, status, nowMs, onEffect, interactive }: AppProps): React.JSX.Element {
  const live = useSyncExternalStore(store.subscribe, store.getSnapshot);
  const [ui, setUi] = useState<UiState>(INITIAL_UI);
  const frozen = useRef<StoreSnapshot | null>(null);
  const { stdout } = useStdout();
  const feed = status();
  // Ink redraws its last frame on a resize but does not render again: the layout must follow the new size.
  const [, onResize] = useReducer((n: number) => n + 1, 0);
  useEffect(() => {
    stdout.on('resize', onResize);
    return () => void stdout.off('resize', onResize);
  }, [stdout]);

  // Keys can arrive faster than frames: the reducer reads the latest state, not the one of the last render.
  const uiRef = useRef<UiState>(INITIAL_UI);
  useInput(
    (input, key) => {
      const before = uiRef.current;
      const { state, effect } = reduceKey(before, { input, ctrl: key.ctrl, return: key.return, escape: key.escape, backspace: key.backspace, delete: key.delete }, { writesJournal: status().writesJournal });
      if (state.paused && !before.paused) frozen.current = store.getSnapshot();
      uiRef.current = state;
      setUi(state);
      if (effect) onEffect(effect);
    },
    { isActive: interactive },
  );

  // Keys stay live (q still quits); only the drawing is replaced by one line until the terminal grows.
  if (tooSmall(stdout.columns, stdout.rows)) return <Text color="yellow">{tooSmallLine(stdout.columns, stdout.rows)}</Text>;

  const snap = ui.paused && frozen.current ? frozen.current : live;
  const now = estimateNow(snap, feed, ui.paused ? (snap.lastArrivalMs ?? 0) : nowMs());
  const vm = buildViewModel({
    feed,
    live: snap.live,
    result: snap.result,
    rig: snap.rig,
    now_s: now,
    since_s: snap.firstHost_s ?? 0,
    heartbeatInterval_s: snap.heartbeatInterval_s,
    restartedAt_s: snap.restartedAt_s,
    paused: ui.paused,
  });
  const L = layoutFor(stdout.columns, stdout.rows, vm.room ? 1 : 0);

  const { periodChart, amplitudeChart } = chartSpecs(vm, L);

  return (
    <Box flexDirection="column" width={L.width}>
      <StatusBar title={vm.title} items={vm.status} width={L.width} />
      <Box flexDirection="row" height={L.bodyHeight}>
        {ui.mode.kind === 'help' ? (
          <HelpPanel warnings={vm.warnings} width={L.width} plane={vm.plane !== null} room={vm.room !== null} />
        ) : (
          <>
            <Box flexDirection="column" width={L.numbersWidth}>
              <NumbersPanel rows={vm.numbers} width={L.numbersWidth} />
              {vm.plane ? <PlanePanel plane={vm.plane} /> : null}
            </Box>
            <Box width={1} />
            <Box flexDirection="column" width={L.plotWidth}>
              <ChartBox spec={periodChart} />
              <ChartBox spec={amplitudeChart} />
            </Box>
          </>
        )}
      </Box>
      {vm.room ? <RoomLineView room={vm.room} width={L.width} /> : null}
      <HealthLine items={vm.health} />
      <WarningLine warnings={vm.warnings} />
      <Footer ui={ui} />
    </Box>
  );
}
