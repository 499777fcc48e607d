/**
 * Line-of-sight free-space optical gain from a Lambertian emitter to a small detector.
 *
 * Kahn & Barry, "Wireless infrared communications", Proc. IEEE 85(2):265–298, 1997:
 *   Lambertian order m = −ln 2 / ln(cos Φ½)   (Φ½: semi-angle at half intensity),
 *   radiant intensity R(φ) = (m + 1)/(2π) · cos^m φ per watt emitted,
 *   DC gain H(0) = (m + 1)·A / (2π d²) · cos^m φ · Ts(ψ) · g(ψ) · cos ψ   for 0 ≤ ψ ≤ Ψc,
 *   H(0) = 0 beyond the field of view (ψ > Ψc) or behind the emitter (φ ≥ 90°).
 * Concentrator gain g = n² / sin² Ψc for an ideal non-imaging concentrator
 * (Komine & Nakagawa, IEEE Trans. Consumer Electronics 50(1):100–107, 2004).
 * Valid when d is much larger than the detector's size (the far field of the detector).
 */
import {
  requireNumber,
  requireObject,
  requirePositive,
  describeValue,
} from '../settings-checks.ts';
import { InputError } from '../../errors.ts';

const RADIANS_PER_DEGREE = Math.PI / 180;

export interface LineOfSightSettings {
  /** Emitter semi-angle at half intensity Φ½ (60° is an ideal Lambertian, m = 1). */
  readonly halfPowerSemiAngleDegrees: number;
  /** Active area of the detector (with its lens, if the lens is counted in the gain). */
  readonly detectorAreaSquareMetres: number;
  /** Emitter-to-detector distance d. */
  readonly distanceMetres: number;
  /** Angle φ between the emitter's axis and the line to the detector. */
  readonly irradianceAngleDegrees: number;
  /** Angle ψ between the detector's normal and the line to the emitter. */
  readonly incidenceAngleDegrees: number;
  /** Optical filter transmission Ts (0…1). */
  readonly filterTransmission: number;
  /** Refractive index n of a concentrator in front of the detector, or null for none (g = 1). */
  readonly concentratorRefractiveIndex: number | null;
  /** Field-of-view semi-angle Ψc of the receiver; light arriving at ψ > Ψc is not collected. */
  readonly fieldOfViewSemiAngleDegrees: number;
}

/** Checks line-of-sight settings read from a file; `where` prefixes field names in errors. */
export function checkLineOfSightSettings(value: unknown, where = 'lightPath'): LineOfSightSettings {
  const s = requireObject(where, value);
  const n = s.concentratorRefractiveIndex;
  if (n !== null) {
    requireNumber(`${where}.concentratorRefractiveIndex`, n, 'a refractive index from 1 to 4, or null for no concentrator', {
      min: 1,
      max: 4,
    });
  }
  return {
    halfPowerSemiAngleDegrees: requireNumber(
      `${where}.halfPowerSemiAngleDegrees`,
      s.halfPowerSemiAngleDegrees,
      'a half-power semi-angle between 0 and 90 degrees (exclusive)',
      { min: 0, max: 90, minExclusive: true, maxExclusive: true },
    ),
    detectorAreaSquareMetres: requirePositive(
      `${where}.detectorAreaSquareMetres`,
      s.detectorAreaSquareMetres,
      'a positive area in square metres (1 mm² = 1e-6)',
    ),
    distanceMetres: requirePositive(`${where}.distanceMetres`, s.distanceMetres, 'a positive number of metres'),
    irradianceAngleDegrees: requireNumber(`${where}.irradianceAngleDegrees`, s.irradianceAngleDegrees, 'an angle from 0 to 180 degrees', {
      min: 0,
      max: 180,
    }),
    incidenceAngleDegrees: requireNumber(`${where}.incidenceAngleDegrees`, s.incidenceAngleDegrees, 'an angle from 0 to 180 degrees', {
      min: 0,
      max: 180,
    }),
    filterTransmission: requireNumber(`${where}.filterTransmission`, s.filterTransmission, 'a transmission from 0 to 1', {
      min: 0,
      max: 1,
    }),
    concentratorRefractiveIndex: n as number | null,
    fieldOfViewSemiAngleDegrees: requireNumber(
      `${where}.fieldOfViewSemiAngleDegrees`,
      s.fieldOfViewSemiAngleDegrees,
      'a field-of-view semi-angle above 0 and up to 90 degrees',
      { min: 0, max: 90, minExclusive: true },
    ),
  };
}

/** Lambertian order m = −ln 2 / ln(cos Φ½). */
export function lambertianOrder(halfPowerSemiAngleDegrees: number): number {
  if (!(halfPowerSemiAngleDegrees > 0 && halfPowerSemiAngleDegrees < 90)) {
    throw new InputError(
      'halfPowerSemiAngleDegrees',
      'a half-power semi-angle between 0 and 90 degrees (exclusive)',
      `got ${describeValue(halfPowerSemiAngleDegrees)}`,
    );
  }
  return -Math.LN2 / Math.log(Math.cos(halfPowerSemiAngleDegrees * RADIANS_PER_DEGREE));
}

/** Ideal non-imaging concentrator gain g = n² / sin² Ψc. */
export function concentratorGain(refractiveIndex: number, fieldOfViewSemiAngleDegrees: number): number {
  const s = Math.sin(fieldOfViewSemiAngleDegrees * RADIANS_PER_DEGREE);
  return (refractiveIndex * refractiveIndex) / (s * s);
}

/** DC gain H(0) (detected power / emitted power) of the line-of-sight path. */
export function lineOfSightGain(settings: LineOfSightSettings): number {
  const s = checkLineOfSightSettings(settings);
  if (s.incidenceAngleDegrees > s.fieldOfViewSemiAngleDegrees) return 0;
  if (s.irradianceAngleDegrees >= 90) return 0;
  const m = lambertianOrder(s.halfPowerSemiAngleDegrees);
  const cosPhi = Math.cos(s.irradianceAngleDegrees * RADIANS_PER_DEGREE);
  const cosPsi = Math.cos(s.incidenceAngleDegrees * RADIANS_PER_DEGREE);
  const g = s.concentratorRefractiveIndex === null ? 1 : concentratorGain(s.concentratorRefractiveIndex, s.fieldOfViewSemiAngleDegrees);
  const d = s.distanceMetres;
  return (((m + 1) * s.detectorAreaSquareMetres) / (2 * Math.PI * d * d)) * cosPhi ** m * s.filterTransmission * g * Math.max(cosPsi, 0);
}

/**
 * Geometry of a ceiling emitter pointing straight down and a detector facing straight
 * up: d = √(h² + r²) and φ = ψ = atan(r / h).
 */
export function downwardGeometry(heightMetres: number, horizontalOffsetMetres: number): {
  distanceMetres: number;
  irradianceAngleDegrees: number;
  incidenceAngleDegrees: number;
} {
  requirePositive('heightMetres', heightMetres, 'a positive height in metres');
  requireNumber('horizontalOffsetMetres', horizontalOffsetMetres, 'a non-negative offset in metres', { min: 0 });
  const angleDegrees = Math.atan2(horizontalOffsetMetres, heightMetres) / RADIANS_PER_DEGREE;
  return {
    distanceMetres: Math.hypot(heightMetres, horizontalOffsetMetres),
    irradianceAngleDegrees: angleDegrees,
    incidenceAngleDegrees: angleDegrees,
  };
}
