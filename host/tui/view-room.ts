// The room line as data: the latest reading with its air density and age, or the sensor's fault in a few words.
import { SENSOR_FAULTS } from '../../protocol/records.ts';
import type { LiveRoom } from '../pipeline/live-state.ts';
import { formatDuration, formatFixed } from './format.ts';
import type { Tone } from './view-model.ts';

export interface RoomItem {
  readonly label: string;
  readonly value: string;
}

export interface RoomLine {
  readonly items: readonly RoomItem[];
  readonly tone: Tone;
}

/** Short words per fault bit of the `S` record (protocol/SPEC.md, section 4.6), in bit order. */
const FAULT_WORDS: readonly [number, string][] = [
  [SENSOR_FAULTS.absent, 'not answering'],
  [SENSOR_FAULTS.bus, 'bus fault'],
  [SENSOR_FAULTS.chip, 'wrong chip'],
  [SENSOR_FAULTS.off, 'readings off'],
];

/** The state of a sensor that reports a fault; the device retries by itself except when readings are off. */
function faultText(state: number): string {
  const words = FAULT_WORDS.filter(([bit]) => state & bit).map(([, w]) => w);
  if (words.length === 0) words.push(`state ${state.toString(16)}`);
  return state === SENSOR_FAULTS.off ? words.join(', ') : `${words.join(', ')} (retrying)`;
}

/**
 * Null when the run has no room sensor; the reading's age against the view's `now_s` (host s since `#start`). The reading as sent (°C to hundredths, Pa as hPa to the pascal, %RH to
 * a tenth) and the air density to three decimals: a kelvin moves it by 1/293 of itself, 0.004 kg/m³.
 */
export function roomLine(room: LiveRoom | null, now_s: number, stale = false): RoomLine | null {
  if (!room) return null;
  const r = room.reading;
  const faulted = room.sensorState !== null && room.sensorState !== 0;
  const items: RoomItem[] = [];
  if (faulted) items.push({ label: 'sensor', value: faultText(room.sensorState!) });
  // A faulted sensor's last reading is old news: its temperature and age only, so the fault stays in view.
  if (r && faulted) items.push({ label: 'last', value: `${formatFixed(r.tempC, 2)} °C` });
  else if (r)
    items.push(
      { label: 'room', value: `${formatFixed(r.tempC, 2)} °C · ${formatFixed(r.pressPa / 100, 2)} hPa · ${formatFixed(r.rhPct, 1)} %RH` },
      { label: 'air', value: `${formatFixed(r.airDensity_kg_m3, 3)} kg/m³` },
    );
  if (r) items.push({ label: 'read', value: `${formatDuration(now_s - r.host_s)} ago` });
  if (!r && !faulted) items.push({ label: 'room', value: 'sensor ready, first reading to come' });
  // A reading overdue by the warnings' rule (stale) is shown in the warning tone, as a fault is.
  const tone: Tone = !faulted ? (r ? (stale ? 'bad' : 'normal') : 'muted') : room.sensorState === SENSOR_FAULTS.off ? 'muted' : 'bad';
  return { items, tone };
}
