// Stage: from the pendulum's T0 to g: the corrections of a real pendulum (pendulum-corrections.ts), and the g expected.
import type { Rig } from '../../../protocol/rig.ts';
import { normalGravityAtHeight } from '../normal-gravity.ts';
import { pendulumModel, type PendulumModel } from '../pendulum-corrections.ts';

/** T0 without the damping shift, and g from it. */
export interface Corrected {
  readonly model: PendulumModel | null;
  /** T0 (s) of the undamped pendulum: T0 / (1 + 1/(8Q²)); null without T0. */
  readonly T0: number | null;
  /** g = 4π²·L_eff·(1 + ε_air)²/T0² (m/s²); null without a rig or T0. */
  readonly g: number | null;
}

/** The corrections stage; Q (from the decay) sizes the damping correction. */
export function correctT0(rig: Rig | null, T0: number | null, Q: number | null): Corrected {
  const model = rig && T0 !== null ? pendulumModel(rig, (2 * Math.PI) / T0, Q) : null;
  const dampRel = model ? model.lines.find((l) => l.id === 'damping')!.period_rel : 0;
  const T0u = T0 !== null ? T0 / (1 + dampRel) : null;
  const g = model && T0u !== null ? (4 * Math.PI * Math.PI * model.L_eff_m * (1 + model.air_rel) ** 2) / (T0u * T0u) : null;
  return { model, T0: T0u, g };
}

/** Normal gravity at the rig's latitude and elevation (0 m when not given); null without a latitude. */
export function expectedGravity(rig: Rig | null): number | null {
  return rig && rig.latitude_deg !== undefined ? normalGravityAtHeight(rig.latitude_deg, rig.elevation_m ?? 0) : null;
}
