import { describe, expect, it } from 'vitest';
import { freeAirGradient, normalGravity, normalGravityAtHeight } from '../../host/analysis/normal-gravity.ts';

describe('WGS-84 normal gravity (NIMA TR8350.2, 3rd ed., ch. 4; docs/references.md#ref-normal-gravity)', () => {
  it('equator 9.7803253359 m/s² and poles 9.8321849378 m/s² (TR8350.2 γe, γp)', () => {
    expect(normalGravity(0)).toBeCloseTo(9.7803253359, 10);
    expect(normalGravity(90)).toBeCloseTo(9.8321849378, 9);
    expect(normalGravity(-90)).toBeCloseTo(9.8321849378, 9);
  });

  it('45° gives 9.8061977694 and g_n = 9.80665 falls at 45.4996° (docs/references.md#ref-normal-gravity, computed with mpmath)', () => {
    expect(normalGravity(45)).toBeCloseTo(9.8061977694, 9);
    expect(normalGravity(45.4996)).toBeCloseTo(9.80665, 6);
  });

  it.each([
    // Invented sites of docs/references.md#ref-normal-gravity: latitude, h, γ0, γ_h by the second-order height formula
    [12.0, 5, 9.782557618, 9.78254218],
    [52.0, 40, 9.812474078, 9.812350678],
    [46.5, 1500, 9.807554979, 9.802928452],
    [-35.0, 800, 9.797336013, 9.794867449],
  ])('site at %f° and %f m', (lat, h, g0, gh) => {
    expect(normalGravity(lat)).toBeCloseTo(g0, 9);
    expect(normalGravityAtHeight(lat, h)).toBeCloseTo(gh, 8);
  });

  it('free-air gradient −3.08769e-6 (0°), −3.08555e-6 (45°), −3.08339e-6 s⁻² (90°) (docs/references.md#ref-normal-gravity, derived)', () => {
    expect(freeAirGradient(0)).toBeCloseTo(-3.08769e-6, 10);
    expect(freeAirGradient(45)).toBeCloseTo(-3.08555e-6, 10);
    expect(freeAirGradient(90)).toBeCloseTo(-3.08339e-6, 10);
  });
});
