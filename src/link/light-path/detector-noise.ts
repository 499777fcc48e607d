/**
 * Noise of the detector current: shot noise of the photocurrent and thermal noise
 * of a load resistance, added to a chunk of current samples.
 *
 * Shot noise: one-sided power spectral density 2·q·I (Schottky, Ann. Phys. 57:541, 1918),
 * so i_rms = √(2·q·I·B) in a bandwidth B. Thermal noise of a resistance R as a parallel
 * current source: density 4·k·T/R, i_rms = √(4·k·T·B/R) (Johnson 1928, Nyquist 1928).
 *
 * Discrete-time convention: a white sequence at sample rate fs with per-sample variance
 * σ² has a one-sided density 2σ²/fs spread evenly over 0…fs/2. Matching a one-sided
 * density S therefore needs σ² = S·fs/2, i.e. the simulated bandwidth is B = fs/2:
 *   shot σ² = 2qI·fs/2 = q·I·fs,   thermal σ² = (4kT/R)·fs/2 = 2kT·fs/R.
 * Whatever later band-limits the signal (the receiver's poles, the decimator) then sees
 * the right density in its own band. Shot noise follows the instantaneous current
 * (it is a sample of a Poisson process with that mean rate); a negative current — which
 * a photodetector cannot produce — is given no shot noise. The Gaussian stands in for
 * the Poisson count because a sample holds many electrons (1 µA at 192 kHz: ~3·10⁷).
 */
import { BOLTZMANN_JOULES_PER_KELVIN, ELEMENTARY_CHARGE_COULOMBS } from '../../units/constants.ts';
import { SeededRandom } from '../../numeric/random.ts';
import { InputError } from '../../errors.ts';
import { describeValue, requireChunkFits, requireNumber, requireObject, requirePositive, requireSeed } from '../settings-checks.ts';

/** RMS shot-noise current √(2qIB) for a mean current I in bandwidth B. */
export function shotNoiseRmsAmperes(meanAmperes: number, bandwidthHertz: number): number {
  return Math.sqrt(2 * ELEMENTARY_CHARGE_COULOMBS * Math.max(meanAmperes, 0) * bandwidthHertz);
}

/** RMS thermal-noise current √(4kTB/R) of a resistance R at temperature T in bandwidth B. */
export function thermalNoiseRmsAmperes(ohms: number, kelvin: number, bandwidthHertz: number): number {
  return Math.sqrt((4 * BOLTZMANN_JOULES_PER_KELVIN * kelvin * bandwidthHertz) / ohms);
}

export interface DetectorNoiseSettings {
  /** Rate of the current samples; the simulated noise bandwidth is half of it. */
  readonly sampleRateHertz: number;
  /** Include shot noise of the current (normally true). */
  readonly shotNoise: boolean;
  /** Resistance whose thermal noise current appears in parallel with the detector, or null for none. */
  readonly thermalNoiseOhms: number | null;
  readonly temperatureKelvin: number;
  /** Seed of the noise generator; the same seed gives the same noise. */
  readonly seed: number;
}

/** Checks detector-noise settings read from a file; `where` prefixes field names in errors. */
export function checkDetectorNoiseSettings(value: unknown, where = 'detectorNoise'): DetectorNoiseSettings {
  const s = requireObject(where, value);
  if (typeof s.shotNoise !== 'boolean') {
    throw new InputError(`${where}.shotNoise`, 'true or false', `got ${describeValue(s.shotNoise)}`);
  }
  const ohms = s.thermalNoiseOhms;
  if (ohms !== null) requirePositive(`${where}.thermalNoiseOhms`, ohms, 'a positive resistance in ohms, or null for no thermal noise');
  return {
    sampleRateHertz: requirePositive(`${where}.sampleRateHertz`, s.sampleRateHertz, 'a positive sample rate in hertz'),
    shotNoise: s.shotNoise as boolean,
    thermalNoiseOhms: ohms as number | null,
    temperatureKelvin: requireNumber(`${where}.temperatureKelvin`, s.temperatureKelvin, 'a temperature from 1 to 1000 kelvin', {
      min: 1,
      max: 1000,
    }),
    seed: requireSeed(`${where}.seed`, s.seed),
  };
}

export class DetectorNoise {
  readonly settings: DetectorNoiseSettings;
  /** Per-sample shot variance per ampere of mean current: q·fs (A²/A). */
  private readonly shotVariancePerAmpere: number;
  /** Per-sample thermal standard deviation in amperes: √(2kT·fs/R). */
  readonly thermalSigmaAmperes: number;
  private random: SeededRandom;

  constructor(settings: DetectorNoiseSettings) {
    this.settings = checkDetectorNoiseSettings(settings);
    const fs = this.settings.sampleRateHertz;
    this.shotVariancePerAmpere = this.settings.shotNoise ? ELEMENTARY_CHARGE_COULOMBS * fs : 0;
    this.thermalSigmaAmperes =
      this.settings.thermalNoiseOhms === null
        ? 0
        : thermalNoiseRmsAmperes(this.settings.thermalNoiseOhms, this.settings.temperatureKelvin, fs / 2);
    this.random = new SeededRandom(this.settings.seed);
  }

  /** Noiseless current in (A), current with noise out (A); noise continues across chunks. */
  process(amperes: Float64Array, noisyAmperes: Float64Array): void {
    requireChunkFits('DetectorNoise.process', amperes, noisyAmperes);
    if (noisyAmperes !== amperes) noisyAmperes.set(amperes);
    this.addInPlace(noisyAmperes, amperes.length);
  }

  /** Adds noise to the first `length` samples of `amperes`, in place. */
  addInPlace(amperes: Float64Array, length: number): void {
    if (!(length >= 0 && length <= amperes.length)) throw new RangeError(`DetectorNoise.addInPlace: length ${length} outside 0…${amperes.length}`);
    const shot = this.shotVariancePerAmpere;
    const thermal = this.thermalSigmaAmperes;
    const random = this.random;
    for (let i = 0; i < length; i++) {
      const current = amperes[i];
      let noisy = current;
      if (shot > 0 && current > 0) noisy += Math.sqrt(shot * current) * random.normal();
      if (thermal > 0) noisy += thermal * random.normal();
      amperes[i] = noisy;
    }
  }

  reset(): void {
    this.random = new SeededRandom(this.settings.seed);
  }
}
