/**
 * Microphone: sound pressure (Pa) in, open-circuit output voltage (V) out.
 *
 * Sensitivity is given in dBV/Pa: the output in dB re 1 V rms for 1 Pa rms at 1 kHz
 * (1 Pa ≈ 94 dB SPL, the reference of IEC 60268-4). The capsule is taken as flat
 * over the audio band; the output resistance is not applied here but reported, so
 * that the transmitter circuit puts it in series with this voltage source.
 *
 * Self-noise is the equivalent input noise as an A-weighted sound level, dB(A) SPL,
 * as microphone makers quote it. It is modelled as white pressure noise whose
 * A-weighted level over 20 Hz–20 kHz equals that figure: one-sided density
 * S = p_A² / B_A with B_A = ∫|A(f)|² df over 20 Hz–20 kHz (≈ 12.47 kHz).
 * A white sequence at sample rate fs spreads its variance over 0…fs/2, so the
 * per-sample variance is S·fs/2 (the same convention as detector-noise.ts).
 */
import { SeededRandom } from '../numeric/random.ts';
import { as, type Ohms } from '../units/types.ts';
import { aWeightedNoiseBandwidthHertz } from './acoustics/a-weighting.ts';
import { dbSplToPascals } from './acoustics/sound-level.ts';
import {
  requireChunkFits,
  requireNumber,
  requireObject,
  requirePositive,
  requireSeed,
  describeValue,
} from './settings-checks.ts';
import { InputError } from '../errors.ts';

/** Noise bandwidth of the A weighting over 20 Hz–20 kHz, ≈ 12467 Hz. */
const A_WEIGHTED_BANDWIDTH_HERTZ = aWeightedNoiseBandwidthHertz(20, 20000);

export interface MicrophoneSettings {
  /** Output in dB re 1 V for 1 Pa (e.g. −44 for a typical electret capsule). */
  readonly sensitivityDbvPerPascal: number;
  /** Source resistance of the microphone output, for the circuit to place in series. */
  readonly outputResistanceOhms: number;
  /** Equivalent input noise, A-weighted dB SPL; null for a noiseless microphone. */
  readonly selfNoiseDbaSpl: number | null;
  /** Rate of the chunks given to `process`. */
  readonly sampleRateHertz: number;
  /** Seed of the self-noise generator; the same seed gives the same noise. */
  readonly seed: number;
}

/** Checks microphone settings read from a file; `where` prefixes field names in errors. */
export function checkMicrophoneSettings(value: unknown, where = 'microphone'): MicrophoneSettings {
  const s = requireObject(where, value);
  const selfNoise = s.selfNoiseDbaSpl;
  if (selfNoise !== null) {
    requireNumber(`${where}.selfNoiseDbaSpl`, selfNoise, 'an A-weighted noise level from −20 to 120 dB SPL, or null for none', {
      min: -20,
      max: 120,
    });
  }
  return {
    sensitivityDbvPerPascal: requireNumber(
      `${where}.sensitivityDbvPerPascal`,
      s.sensitivityDbvPerPascal,
      'a sensitivity from −100 to +20 dBV/Pa (dB re 1 V at 1 Pa)',
      { min: -100, max: 20 },
    ),
    outputResistanceOhms: requireNumber(`${where}.outputResistanceOhms`, s.outputResistanceOhms, 'a resistance from 0 to 1e9 ohms', {
      min: 0,
      max: 1e9,
    }),
    selfNoiseDbaSpl: selfNoise as number | null,
    sampleRateHertz: requirePositive(`${where}.sampleRateHertz`, s.sampleRateHertz, 'a positive sample rate in hertz'),
    seed: requireSeed(`${where}.seed`, s.seed),
  };
}

export class Microphone {
  readonly settings: MicrophoneSettings;
  /** Volts per pascal. */
  readonly sensitivityVoltsPerPascal: number;
  /** Per-sample standard deviation of the self-noise, in pascals. */
  readonly noiseSigmaPascals: number;
  private random: SeededRandom;

  constructor(settings: MicrophoneSettings) {
    this.settings = checkMicrophoneSettings(settings);
    this.sensitivityVoltsPerPascal = 10 ** (this.settings.sensitivityDbvPerPascal / 20);
    this.noiseSigmaPascals = selfNoiseSigmaPascals(this.settings.selfNoiseDbaSpl, this.settings.sampleRateHertz);
    this.random = new SeededRandom(this.settings.seed);
  }

  /** Source resistance for the circuit to put in series with the output voltage. */
  get outputResistanceOhms(): Ohms {
    return as<Ohms>(this.settings.outputResistanceOhms);
  }

  /** Pascals in, volts out, for one chunk; noise continues from the previous chunk. */
  process(pascals: Float64Array, volts: Float64Array): void {
    requireChunkFits('Microphone.process', pascals, volts);
    const gain = this.sensitivityVoltsPerPascal;
    const sigma = this.noiseSigmaPascals;
    const n = pascals.length;
    if (sigma === 0) {
      for (let i = 0; i < n; i++) volts[i] = gain * pascals[i];
      return;
    }
    const random = this.random;
    for (let i = 0; i < n; i++) volts[i] = gain * (pascals[i] + sigma * random.normal());
  }

  /** Back to the state just after construction (the noise restarts from the seed). */
  reset(): void {
    this.random = new SeededRandom(this.settings.seed);
  }
}

/** Per-sample self-noise deviation (Pa) for a dB(A) figure at sample rate fs; 0 if none. */
export function selfNoiseSigmaPascals(selfNoiseDbaSpl: number | null, sampleRateHertz: number): number {
  if (selfNoiseDbaSpl === null) return 0;
  if (!(sampleRateHertz > 0)) {
    throw new InputError('sampleRateHertz', 'a positive sample rate in hertz', `got ${describeValue(sampleRateHertz)}`);
  }
  const weightedPascals = dbSplToPascals(selfNoiseDbaSpl);
  const densityPascalsSquaredPerHertz = (weightedPascals * weightedPascals) / A_WEIGHTED_BANDWIDTH_HERTZ;
  return Math.sqrt((densityPascalsSquaredPerHertz * sampleRateHertz) / 2);
}
