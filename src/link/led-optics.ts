/**
 * LED junction current → emitted optical power.
 *
 * Each electron through the junction yields η_ext photons that leave the chip
 * (external quantum efficiency), each carrying E = h·c/λ, so
 *   P = η_ext · (h·c/(λ·q)) · I = η_ext · E_photon[eV] · I.
 * Reverse or zero current emits nothing. Efficiency droop at high current and the
 * LED's own speed (MHz, far above audio) are outside this block.
 */
import { photonEnergyVolts } from '../units/constants.ts';
import { requireChunkFits, requireNumber, requireObject } from './settings-checks.ts';

export interface LedOpticsSettings {
  /** Photons out per electron through the junction, 0 < η ≤ 1 (indicator LEDs: a few % to ~30 %). */
  readonly externalQuantumEfficiency: number;
  /** Peak emission wavelength, in metres (630 nm = 630e-9). */
  readonly wavelengthMetres: number;
}

/** Checks LED optics settings read from a file; `where` prefixes field names in errors. */
export function checkLedOpticsSettings(value: unknown, where = 'led'): LedOpticsSettings {
  const s = requireObject(where, value);
  return {
    externalQuantumEfficiency: requireNumber(
      `${where}.externalQuantumEfficiency`,
      s.externalQuantumEfficiency,
      'an efficiency above 0 and up to 1',
      { min: 0, max: 1, minExclusive: true },
    ),
    wavelengthMetres: requireNumber(`${where}.wavelengthMetres`, s.wavelengthMetres, 'a wavelength from 1e-7 to 1e-5 metres (100 nm to 10 µm)', {
      min: 1e-7,
      max: 1e-5,
    }),
  };
}

/** Optical watts per ampere of junction current: η·hc/(λq). */
export function ledWattsPerAmpere(settings: LedOpticsSettings): number {
  const s = checkLedOpticsSettings(settings);
  return s.externalQuantumEfficiency * photonEnergyVolts(s.wavelengthMetres);
}

export class LedOptics {
  readonly settings: LedOpticsSettings;
  readonly wattsPerAmpere: number;

  constructor(settings: LedOpticsSettings) {
    this.settings = checkLedOpticsSettings(settings);
    this.wattsPerAmpere = ledWattsPerAmpere(this.settings);
  }

  /** Junction current (A) in, optical power (W) out. */
  process(amperes: Float64Array, watts: Float64Array): void {
    requireChunkFits('LedOptics.process', amperes, watts);
    const k = this.wattsPerAmpere;
    const n = amperes.length;
    for (let i = 0; i < n; i++) {
      const current = amperes[i];
      watts[i] = current > 0 ? k * current : 0;
    }
  }

  /** Stateless; present so every block can be reset alike. */
  reset(): void {}
}
