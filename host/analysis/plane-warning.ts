// How much a one-beam run could be biased by the swing plane turning, and what fixes it.
import { EARTH_RATE_DEG_PER_H } from './plane-rate.ts';
import { WARN } from './warning.ts';

export interface OneBeamPlaneRisk {
  /** Turn of the plane over the run from the Earth alone (°), at the rig's latitude or, without one, at a pole. */
  readonly turn_deg: number;
  /** 1 − cos(turn): how far low the last amplitudes could read. */
  readonly amplitude_low: number;
  readonly latitude_known: boolean;
}

/**
 * The Earth alone turns a swing on a support that is the same in every direction by 15.04°·sin(latitude) an hour;
 * one beam then reads the amplitude low by cos ψ (docs/two-beam-geometry.md). An anisotropic support can turn it
 * more (or hold it). Null when the bias stays under WARN.planeBias (its words: host/output/warning-words.ts).
 */
export function oneBeamPlaneRisk(durationS: number, latitudeDeg?: number): OneBeamPlaneRisk | null {
  const s = latitudeDeg === undefined ? 1 : Math.abs(Math.sin((latitudeDeg * Math.PI) / 180));
  const turn = ((EARTH_RATE_DEG_PER_H * s * durationS) / 3600) % 360;
  const low = 1 - Math.cos(Math.min(90, turn) * (Math.PI / 180));
  return low >= WARN.planeBias ? { turn_deg: turn, amplitude_low: low, latitude_known: latitudeDeg !== undefined } : null;
}
