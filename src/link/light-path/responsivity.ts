/**
 * Responsivity of a photodetector: amperes of photocurrent per watt of light,
 * R = η·q·λ/(h·c) = η / E_photon[eV] (each absorbed photon gives η electrons).
 */
import { photonEnergyVolts } from '../../units/constants.ts';
import { requireNumber } from '../settings-checks.ts';

export function responsivityAmperesPerWatt(quantumEfficiency: number, wavelengthMetres: number): number {
  requireNumber('quantumEfficiency', quantumEfficiency, 'a quantum efficiency above 0 and up to 1', { min: 0, max: 1, minExclusive: true });
  requireNumber('wavelengthMetres', wavelengthMetres, 'a wavelength from 1e-7 to 1e-5 metres (100 nm to 10 µm)', { min: 1e-7, max: 1e-5 });
  return quantumEfficiency / photonEnergyVolts(wavelengthMetres);
}
