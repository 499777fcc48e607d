import { describe, expect, it } from 'vitest';
import {
  checkLineOfSightSettings,
  concentratorGain,
  downwardGeometry,
  lambertianOrder,
  lineOfSightGain,
  type LineOfSightSettings,
} from '../../../src/link/light-path/lambertian.ts';

const onAxis: LineOfSightSettings = {
  halfPowerSemiAngleDegrees: 60,
  detectorAreaSquareMetres: 1e-4,
  distanceMetres: 1,
  irradianceAngleDegrees: 0,
  incidenceAngleDegrees: 0,
  filterTransmission: 1,
  concentratorRefractiveIndex: null,
  fieldOfViewSemiAngleDegrees: 90,
};

describe('Lambertian order', () => {
  // Kahn & Barry, Proc. IEEE 85(2) 1997: m = −ln 2 / ln cos Φ½, evaluated by hand
  // (cos 60° = 1/2 → 1; cos² 45° = 1/2 → 2; the others numerically).
  it.each([
    [60, 1],
    [45, 2],
    [30, 4.818842],
    [15, 19.993727],
    [70, 0.646059],
  ])('is m = %d for Φ½ = %d°', (angle, m) => {
    expect(Math.abs(lambertianOrder(angle) - m)).toBeLessThan(1e-6);
  });

  it('refuses a half-power angle of 90° or more', () => {
    expect(() => lambertianOrder(90)).toThrow(/halfPowerSemiAngleDegrees: got 90/);
  });
});

describe('line-of-sight DC gain', () => {
  // Kahn & Barry 1997 H(0) = (m+1)A/(2πd²)·cos^m φ·cos ψ; m = 1, A = 1 cm², d = 1 m, on axis:
  // 2·1e-4/(2π) = 1e-4/π = 3.183099e-5.
  it('is 3.183099e-5 for an ideal Lambertian emitter, 1 cm² at 1 m on axis', () => {
    expect(lineOfSightGain(onAxis)).toBeCloseTo(1e-4 / Math.PI, 15);
    expect(Math.abs(lineOfSightGain(onAxis) / 3.183099e-5 - 1)).toBeLessThan(1e-6);
  });

  // Same formula, Φ½ = 30° (m = 4.818842), A = 1 cm², d = 0.5 m, on axis: (m+1)·1e-4/(2π·0.25) = 3.704390e-4.
  it('is 3.704390e-4 for Φ½ = 30°, 1 cm² at 0.5 m on axis', () => {
    const h = lineOfSightGain({ ...onAxis, halfPowerSemiAngleDegrees: 30, distanceMetres: 0.5 });
    expect(Math.abs(h / 3.70439e-4 - 1)).toBeLessThan(1e-6);
  });

  // Kahn & Barry 1997 gain with the Komine & Nakagawa 2004 concentrator g = n²/sin²Ψc:
  // Φ½ = 70° (m = 0.646059), height 2 m, offset 1 m → d = √5 m, cos φ = cos ψ = 2/√5,
  // A = 1 cm², n = 1.5, Ψc = 60° → g = 2.25/0.75 = 3;
  // H = 1.646059·1e-4/(2π·5)·(2/√5)^0.646059·3·(2/√5) = 1.308148e-5 (recomputed by hand/python).
  it('is 1.308148e-5 for Φ½ = 70°, 2 m height, 1 m offset, 1 cm², n = 1.5, Ψc = 60°', () => {
    const geometry = downwardGeometry(2, 1);
    expect(geometry.distanceMetres).toBeCloseTo(Math.sqrt(5), 14);
    expect(geometry.irradianceAngleDegrees).toBeCloseTo(26.5650512, 6);
    const h = lineOfSightGain({
      ...onAxis,
      halfPowerSemiAngleDegrees: 70,
      ...geometry,
      concentratorRefractiveIndex: 1.5,
      fieldOfViewSemiAngleDegrees: 60,
    });
    expect(Math.abs(h / 1.308148e-5 - 1)).toBeLessThan(1e-6);
  });

  // Komine & Nakagawa 2004: g = n²/sin²Ψc; n = 1.5, Ψc = 60° → 3; Ψc = 90° → n².
  it('uses a concentrator gain n²/sin²Ψc', () => {
    expect(concentratorGain(1.5, 60)).toBeCloseTo(3, 12);
    expect(concentratorGain(1.5, 90)).toBeCloseTo(2.25, 12);
  });

  // Kahn & Barry 1997: H(0) = 0 for ψ > Ψc (outside the receiver's field of view).
  it('is zero when the light arrives outside the field of view and not zero at its edge', () => {
    const s = { ...onAxis, fieldOfViewSemiAngleDegrees: 30 };
    expect(lineOfSightGain({ ...s, incidenceAngleDegrees: 30.001 })).toBe(0);
    expect(lineOfSightGain({ ...s, incidenceAngleDegrees: 30 })).toBeGreaterThan(0);
  });

  it('is zero behind the emitter (φ ≥ 90°)', () => {
    expect(lineOfSightGain({ ...onAxis, irradianceAngleDegrees: 90 })).toBe(0);
    expect(lineOfSightGain({ ...onAxis, irradianceAngleDegrees: 135 })).toBe(0);
  });

  // Kahn & Barry 1997: the radiant intensity (m+1)/(2π)·cos^m φ integrates to 1 over the hemisphere,
  // so the gains of detectors tiling an infinite plane facing the emitter sum to 1 (energy balance).
  it.each([1, 4.818842, 19.993727])('sums to 1 over an infinite facing plane (m = %d)', (m) => {
    const halfAngle = (Math.acos(2 ** (-1 / m)) * 180) / Math.PI;
    const height = 2;
    const steps = 4000; // Simpson over θ = atan(r/h) in [0, 90°)
    const top = (Math.PI / 2) * (1 - 1e-9);
    let sum = 0;
    for (let i = 0; i <= steps; i++) {
      const theta = (i * top) / steps;
      const r = height * Math.tan(theta);
      const drDtheta = height / Math.cos(theta) ** 2;
      const perArea = lineOfSightGain({
        ...onAxis,
        halfPowerSemiAngleDegrees: halfAngle,
        detectorAreaSquareMetres: 1,
        ...downwardGeometry(height, r),
      });
      const integrand = perArea * 2 * Math.PI * r * drDtheta; // ring area 2πr·dr
      sum += (i === 0 || i === steps ? 1 : i % 2 === 1 ? 4 : 2) * integrand;
    }
    expect(Math.abs((sum * top) / steps / 3 - 1)).toBeLessThan(1e-6);
  });

  it('names the field of bad settings', () => {
    expect(() => checkLineOfSightSettings({ ...onAxis, distanceMetres: -2 })).toThrow(
      'lightPath.distanceMetres: got -2; expected a positive number of metres',
    );
    expect(() => checkLineOfSightSettings({ ...onAxis, filterTransmission: 1.5 })).toThrow(/lightPath\.filterTransmission: got 1.5/);
    expect(() => checkLineOfSightSettings({ ...onAxis, concentratorRefractiveIndex: 0.5 })).toThrow(
      /lightPath\.concentratorRefractiveIndex: got 0.5/,
    );
    expect(() => checkLineOfSightSettings({ ...onAxis, fieldOfViewSemiAngleDegrees: 0 })).toThrow(/fieldOfViewSemiAngleDegrees/);
  });
});
