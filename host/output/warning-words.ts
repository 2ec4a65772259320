// The one table that turns typed warnings (host/analysis/warning.ts) into words: for the terminal summary, the
// live view, the report and the `text` of analyze --json. Flag names and advice belong here, not in the core.
import type { Warning, WarningKind } from '../analysis/warning.ts';
import { gateAdvice } from './gate-words.ts';
import { plusMinus } from './value-u.ts';

type Words = { readonly [K in WarningKind]: (w: Extract<Warning, { kind: K }>) => string };

const deg = (x: number): string => x.toFixed(2);
const int = (x: number): string => x.toFixed(0);

const WORDS: Words = {
  'boot-without-hello': (w) => `boot ${w.boot} started without a hello: assuming ${w.hz} ticks/s`,
  'rig-line-unusable': (w) => `the journal's #rig line is not usable (${w.detail}); give --rig FILE`,
  'malformed-journal-lines': (w) => `${w.count} journal line(s) were not in journal format and were skipped`,
  'pps-unusable': (w) => `--clock pps: no usable 1 PPS input (${w.pulses} pulses); using the host clock instead`,
  'clock-too-few-heartbeats': () => 'too few heartbeats to calibrate the device clock against the host: using the nominal rate',
  'clock-run-too-short': (w) =>
    `the run is too short (${int(w.span_s)} s of heartbeats, under ${int(w.min_span_s)} s) to trust a host-clock calibration (it gave ${plusMinus(w.ppm, w.u_ppm, ' ppm')}): using the nominal rate; force it with --clock host`,
  'clock-forced-short': (w) => `--clock host over only ${int(w.span_s)} s of heartbeats: the rate may be off by more than its stated uncertainty`,
  'clock-drift': (w) => `the device clock drifted ${w.drift_ppm_per_h.toFixed(2)} ppm/h during the run (temperature?); the mean rate is used`,
  'clock-foreign-rate': (w) =>
    `the device's clock ran ${w.ratio.toFixed(2)} times as fast as the host's, beyond any board oscillator (a simulator faster than real time, or a wrong tick rate in the hello?): times and periods are on the device clock at its nominal rate`,
  'clock-nominal': (w) => `g uses the nominal device clock (±${int(w.u_ppm)} ppm assumed): its uncertainty is dominated by the clock`,
  'clock-not-negligible': () => 'the clock calibration is too uncertain to be negligible: record longer, or give --clock pps / --clock <ppm>',
  'passes-rejected-transit': (w) => `${w.count} pass(es) rejected: transit time unlike the neighbours' (an object through the beam?)`,
  'passes-rejected-timing': (w) => `${w.count} pass(es) rejected: off the beat of the swing (an object through the beam?)`,
  'long-gaps': (w) => `${w.count} gap(s) too long to bridge: the run is analysed in ${w.segments} segments`,
  'passes-unsequenced': (w) => `${w.count} pass(es) left out: the swing no longer cleared the beam, or too few passes in a row to follow the beat`,
  'passes-slow': (w) => `${w.count} pass(es) barely cleared the beam (transit over a third of the half-period): used for amplitudes only`,
  'periods-clipped': (w) => `${w.count} period(s) far from the rest were left out of the mean of periods`,
  'no-valid-passes': () => 'no valid passes: nothing to analyse',
  'no-full-period': () => 'fewer than three passes in a row: no full period yet',
  'passes-without-amplitude': (w) =>
    `${w.count} pass(es) had a transit longer than a swing that just clears the beam would give: no amplitude for them` +
    (w.well_clear > 0 ? ` (${w.well_clear} of them well clear of the beam: check flag_width_m and length_m)` : ' (the swing was dying out)'),
  'no-rig': () => 'no rig description: amplitudes, the reduction to zero amplitude and g are not available (give --rig FILE)',
  'damping-too-few': (w) => `too few swings to fit the damping (needs ≥ ${w.needed} passes with an amplitude, had ${w.count})`,
  'no-measurable-decay': (w) =>
    `no measurable decay over the run (amplitude ${deg(w.amplitude_min_deg)}° to ${deg(w.amplitude_max_deg)}°): ` +
    `${w.q_lower !== null ? `Q > ${w.q_lower.toPrecision(2)} (two standard uncertainties)` : 'Q unbounded'}; a longer run shows the damping`,
  'period-law-unfit': () => 'too few periods or too narrow an amplitude range to fit T = T0(1 + Bθ0² + Cθ0⁴) (B would be uncertain by > 30 %)',
  'c-held': () => 'C is held at 11/3072: the amplitudes do not reach 20°, or do not pin C down (θ0⁴ cannot be told from θ0² there)',
  'gate-delay-prior': (w) =>
    `gate delay: the run's amplitude range is too narrow to calibrate the sensor's on/off delay difference` +
    (w.run_u_s !== null && w.run_s !== null ? ` (the run gives ${plusMinus(w.run_s * 1e6, w.run_u_s * 1e6, ' µs')})` : '') +
    `; amplitudes use the assumed ${plusMinus(w.prior_s * 1e6, w.prior_u_s * 1e6, ' µs')}. A run from a larger release calibrates it`,
  'gate-segments-aligned': (w) => `gate offset: the side of ${w.segments} later segment(s) was matched to the first (passes between segments are not known)`,
  'gate-offset': (w) => `gate ${(Math.abs(w.offset_m) * 1000).toFixed(1)} mm off the lowest point: ${gateAdvice(w.offset_m, w.u_m, w.side)}`,
  'no-elevation': () => 'expected g assumes elevation 0 m (the rig gives no elevation_m)',
  'one-beam-plane': (w) =>
    `one beam over this run: the Earth alone can turn the swing plane ${int(w.turn_deg)}° ${w.latitude_known ? "at the rig's latitude" : 'at most (the rig gives no latitude_deg)'}, ` +
    `so the last amplitudes may read up to ${(100 * w.amplitude_low).toFixed(1)} % low, which looks like damping (an uneven support can turn it faster); ` +
    `a second beam crossed with the first (rig key "beams", channel 1 on D2; hardware-notes/crossed-gate.md) measures the plane and removes the bias`,
  'reversible-other-pivot': (w) =>
    `reversible pendulum, pivot ${w.pivot}: g needs the other pivot too: time it about pivot ${w.other}, then run 'halfswing combine' on both journals`,
  disconnected: () => 'device disconnected: check the cable; reconnecting',
  'no-passes': (w) => `no passes for ${int(w.silent_s)} s (${int(w.periods)} periods): ${noPassesWhy(w)}`,
  'heartbeats-missing': (w) => `no heartbeat for ${int(w.gap_s)} s: device stalled or link lost?`,
  'room-reading-stale': (w) =>
    `last room reading ${int(w.age_s)} s ago, the board reads every ${int(w.interval_s)} s: check the sensor's wiring (hardware-notes/room-sensor.md); timing goes on`,
};

function noPassesWhy(w: Extract<Warning, { kind: 'no-passes' }>): string {
  switch (w.why) {
    case 'small-swing':
      // The size is the last measured swing's; the swing has only shrunk since: "at most".
      return `the bob swings inside the ${w.flag_mm!.toFixed(0)} mm flag (at most ±${w.swing_mm!.toFixed(0)} mm, its last measured swing) and no longer clears the beam: release it again, then press r`;
    case 'blocked':
      return 'the beam stays blocked: is the bob resting in it?';
    case 'dying':
      return 'the swing has died down to the beam width: release it again, then press r';
    case 'unknown':
      return 'is it swinging through the beam?';
  }
}

/** The words of one warning. */
export function warningText(w: Warning): string {
  return (WORDS[w.kind] as (x: Warning) => string)(w);
}

/** A warning as analyze --json writes it: its kind and numbers, and the words. */
export type WarningJson = Warning & { readonly text: string };

export function warningJson(w: Warning): WarningJson {
  return { ...w, text: warningText(w) };
}
