/** Exact SI 2019 defining constants (BIPM SI Brochure, 9th edition, 2019). */
export const BOLTZMANN_JOULES_PER_KELVIN = 1.380649e-23;
export const ELEMENTARY_CHARGE_COULOMBS = 1.602176634e-19;
export const PLANCK_JOULE_SECONDS = 6.62607015e-34;
export const SPEED_OF_LIGHT_METRES_PER_SECOND = 299792458;
export const ZERO_CELSIUS_KELVIN = 273.15;

/** Thermal voltage kT/q in volts. */
export function thermalVoltage(kelvin: number): number {
  return (BOLTZMANN_JOULES_PER_KELVIN * kelvin) / ELEMENTARY_CHARGE_COULOMBS;
}

export function celsiusToKelvin(celsius: number): number {
  return celsius + ZERO_CELSIUS_KELVIN;
}

/** Energy of one photon at `metres` wavelength, in electron-volts (= volts per electron). */
export function photonEnergyVolts(metres: number): number {
  return (PLANCK_JOULE_SECONDS * SPEED_OF_LIGHT_METRES_PER_SECOND) / (metres * ELEMENTARY_CHARGE_COULOMBS);
}
