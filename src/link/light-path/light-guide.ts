/**
 * Light guide (e.g. a plastic optical fibre): fixed coupling loss at the two ends plus
 * attenuation along its length. Loss in dB = coupling + attenuation·length;
 * power transmission T = 10^(−loss/10) (decibels of optical power).
 */
import { requireNumber, requireObject } from '../settings-checks.ts';

export interface LightGuideSettings {
  /** Total loss of coupling light in at the emitter and out at the detector. */
  readonly couplingLossDb: number;
  /** Attenuation along the guide (1 mm PMMA fibre: roughly 0.15–0.2 dB/m at 650 nm). */
  readonly attenuationDbPerMetre: number;
  readonly lengthMetres: number;
}

/** Checks light-guide settings read from a file; `where` prefixes field names in errors. */
export function checkLightGuideSettings(value: unknown, where = 'lightPath'): LightGuideSettings {
  const s = requireObject(where, value);
  return {
    couplingLossDb: requireNumber(`${where}.couplingLossDb`, s.couplingLossDb, 'a coupling loss from 0 to 100 dB', { min: 0, max: 100 }),
    attenuationDbPerMetre: requireNumber(
      `${where}.attenuationDbPerMetre`,
      s.attenuationDbPerMetre,
      'an attenuation from 0 to 100 dB per metre',
      { min: 0, max: 100 },
    ),
    lengthMetres: requireNumber(`${where}.lengthMetres`, s.lengthMetres, 'a length from 0 to 10000 metres', { min: 0, max: 10000 }),
  };
}

/** Total loss of the guide in dB. */
export function lightGuideLossDb(settings: LightGuideSettings): number {
  const s = checkLightGuideSettings(settings);
  return s.couplingLossDb + s.attenuationDbPerMetre * s.lengthMetres;
}

/** Fraction of the emitted optical power that reaches the detector. */
export function lightGuideTransmission(settings: LightGuideSettings): number {
  return 10 ** (-lightGuideLossDb(settings) / 10);
}
