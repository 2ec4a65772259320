// Evaluates a fitted damping law dA/dt = −(a0 + a1·A + a2·A²) forward in time, for drawing the fit over the data.
import type { DampingFit } from '../../analysis/result.ts';

const DEG = Math.PI / 180;

/**
 * Amplitude (degrees) at `n` times from t0 to t1, starting at a0Deg, by classical RK4 with 8 sub-steps per
 * sample (the law is smooth, so this is far finer than a pixel). Ends early once the amplitude reaches zero,
 * which constant friction does in finite time.
 */
export function dampingCurve(fit: DampingFit, t0: number, a0Deg: number, t1: number, n = 160): { t_s: number[]; amplitude_deg: number[] } {
  const f = (a: number): number => -(fit.a0 + fit.a1 * a + fit.a2 * a * a);
  const t_s: number[] = [t0];
  const amplitude_deg: number[] = [a0Deg];
  let a = a0Deg * DEG;
  const sub = 8;
  const h = (t1 - t0) / ((n - 1) * sub);
  for (let i = 1; i < n && a > 0; i++) {
    for (let k = 0; k < sub; k++) {
      const k1 = f(a);
      const k2 = f(a + (h / 2) * k1);
      const k3 = f(a + (h / 2) * k2);
      const k4 = f(a + h * k3);
      a += (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4);
    }
    t_s.push(t0 + (t1 - t0) * (i / (n - 1)));
    amplitude_deg.push(Math.max(0, a / DEG));
  }
  return { t_s, amplitude_deg };
}

/** Q at amplitude A (degrees) implied by the fit, Q = π·A / ΔA per cycle with ΔA = T0·(a0 + a1·A + a2·A²). */
export function qOfAmplitude(fit: DampingFit, T0: number, aDeg: number): number {
  const a = aDeg * DEG;
  const loss = T0 * (fit.a0 + fit.a1 * a + fit.a2 * a * a);
  return loss > 0 ? (Math.PI * a) / loss : Number.NaN;
}
