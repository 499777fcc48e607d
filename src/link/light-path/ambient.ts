/**
 * Ambient light at the detector: a steady optical power plus the flicker of mains
 * lighting. A lamp's light follows its power, which goes as the square of the mains
 * current, so the ripple's fundamental is at twice the mains frequency (100 Hz on
 * 50 Hz mains), with harmonics at its multiples.
 *
 * Waveform: P(t) = P̄·(1 + c·w(t)), w(t) = Σₖ aₖ·cos(2π·k·2f_mains·t + θₖ), k = 1, 2, …,
 * where P̄ is the mean power and c is set so that the modulation depth
 * (P_max − P_min)/(P_max + P_min) — the "percent flicker" of lighting practice —
 * equals the stated depth (0 ≤ depth ≤ 1, so P never goes negative).
 * Samples are computed from the absolute sample index, so chunking never changes them.
 */
import { InputError } from '../../errors.ts';
import { describeValue, requireChunkFits, requireNumber, requireObject, requirePositive } from '../settings-checks.ts';

export interface AmbientLightSettings {
  /** Mean ambient optical power reaching the detector. */
  readonly meanPowerWatts: number;
  /** Mains frequency (50 or 60 Hz); the flicker fundamental is twice this. */
  readonly mainsFrequencyHertz: number;
  /** Flicker modulation depth (P_max − P_min)/(P_max + P_min), 0 for steady light. */
  readonly flickerModulationDepth: number;
  /** Relative amplitudes aₖ of flicker harmonic k = 1, 2, … (first entry is the 2·f_mains fundamental). */
  readonly flickerHarmonicAmplitudes: readonly number[];
  /** Phases θₖ in degrees, one per harmonic (missing entries are 0). */
  readonly flickerHarmonicPhasesDegrees: readonly number[];
  readonly sampleRateHertz: number;
}

/** Checks ambient-light settings read from a file; `where` prefixes field names in errors. */
export function checkAmbientLightSettings(value: unknown, where = 'ambient'): AmbientLightSettings {
  const s = requireObject(where, value);
  const sampleRateHertz = requirePositive(`${where}.sampleRateHertz`, s.sampleRateHertz, 'a positive sample rate in hertz');
  const mainsFrequencyHertz = requireNumber(`${where}.mainsFrequencyHertz`, s.mainsFrequencyHertz, 'a mains frequency from 1 to 1000 Hz', {
    min: 1,
    max: 1000,
  });
  const amplitudes = requireNumberList(`${where}.flickerHarmonicAmplitudes`, s.flickerHarmonicAmplitudes, 'a list of non-negative relative amplitudes', 0);
  if (amplitudes.length === 0 || amplitudes.every((a) => a === 0)) {
    throw new InputError(`${where}.flickerHarmonicAmplitudes`, 'at least one amplitude above 0', `got ${describeValue(s.flickerHarmonicAmplitudes)}`);
  }
  const phases = requireNumberList(`${where}.flickerHarmonicPhasesDegrees`, s.flickerHarmonicPhasesDegrees ?? [], 'a list of phases in degrees', null);
  if (phases.length > amplitudes.length) {
    throw new InputError(`${where}.flickerHarmonicPhasesDegrees`, `at most one phase per harmonic (${amplitudes.length})`, `got ${phases.length}`);
  }
  const highestHertz = 2 * mainsFrequencyHertz * amplitudes.length;
  if (highestHertz >= sampleRateHertz / 2) {
    throw new InputError(
      `${where}.flickerHarmonicAmplitudes`,
      `harmonics below half the sample rate (${sampleRateHertz / 2} Hz)`,
      `got ${amplitudes.length} harmonics reaching ${highestHertz} Hz`,
    );
  }
  return {
    meanPowerWatts: requireNumber(`${where}.meanPowerWatts`, s.meanPowerWatts, 'a non-negative optical power in watts', { min: 0 }),
    mainsFrequencyHertz,
    flickerModulationDepth: requireNumber(`${where}.flickerModulationDepth`, s.flickerModulationDepth, 'a modulation depth from 0 to 1', {
      min: 0,
      max: 1,
    }),
    flickerHarmonicAmplitudes: amplitudes,
    flickerHarmonicPhasesDegrees: phases,
    sampleRateHertz,
  };
}

function requireNumberList(where: string, value: unknown, expected: string, min: number | null): number[] {
  if (!Array.isArray(value)) throw new InputError(where, expected, `got ${describeValue(value)}`);
  return value.map((item, i) =>
    requireNumber(`${where}[${i}]`, item, expected.replace(/^a list of /, 'a '), min === null ? {} : { min }),
  );
}

export class AmbientLight {
  readonly settings: AmbientLightSettings;
  /** Scale c applied to the unit waveform w(t). */
  readonly waveformScale: number;
  private readonly amplitudes: Float64Array;
  private readonly phasesCycles: Float64Array;
  private readonly fundamentalCyclesPerSample: number;
  private sampleIndex = 0;

  constructor(settings: AmbientLightSettings) {
    this.settings = checkAmbientLightSettings(settings);
    const count = this.settings.flickerHarmonicAmplitudes.length;
    this.amplitudes = Float64Array.from(this.settings.flickerHarmonicAmplitudes);
    this.phasesCycles = new Float64Array(count);
    for (let k = 0; k < count; k++) this.phasesCycles[k] = (this.settings.flickerHarmonicPhasesDegrees[k] ?? 0) / 360;
    this.fundamentalCyclesPerSample = (2 * this.settings.mainsFrequencyHertz) / this.settings.sampleRateHertz;
    const { max, min } = this.waveformExtremes();
    const depth = this.settings.flickerModulationDepth;
    // From (1 + c·max − 1 − c·min)/(2 + c·(max + min)) = depth.
    this.waveformScale = (2 * depth) / (max - min - depth * (max + min));
  }

  /** Flicker fundamental in hertz (twice the mains frequency). */
  get flickerFundamentalHertz(): number {
    return 2 * this.settings.mainsFrequencyHertz;
  }

  /** Adds the ambient power to each sample of `input` (W at the detector) into `output`. */
  process(input: Float64Array, output: Float64Array): void {
    requireChunkFits('AmbientLight.process', input, output);
    if (output !== input) output.set(input);
    this.addInPlace(output, input.length);
  }

  /** Adds the ambient power to the first `length` samples of `watts`, in place. */
  addInPlace(watts: Float64Array, length: number): void {
    if (!(length >= 0 && length <= watts.length)) throw new RangeError(`AmbientLight.addInPlace: length ${length} outside 0…${watts.length}`);
    const mean = this.settings.meanPowerWatts;
    const scale = this.waveformScale;
    if (mean === 0 || scale === 0) {
      for (let i = 0; i < length; i++) watts[i] += mean;
    } else {
      const start = this.sampleIndex;
      for (let i = 0; i < length; i++) watts[i] += mean * (1 + scale * this.unitWaveform(start + i));
    }
    this.sampleIndex += length;
  }

  reset(): void {
    this.sampleIndex = 0;
  }

  /** w at absolute sample `index`; the phase is reduced to one cycle first so it stays exact for long runs. */
  private unitWaveform(index: number): number {
    const cycles = index * this.fundamentalCyclesPerSample;
    const fraction = cycles - Math.floor(cycles);
    return this.waveformAtCycles(fraction);
  }

  private waveformAtCycles(fraction: number): number {
    let sum = 0;
    const amplitudes = this.amplitudes;
    const phases = this.phasesCycles;
    for (let k = 0; k < amplitudes.length; k++) {
      sum += amplitudes[k] * Math.cos(2 * Math.PI * ((k + 1) * fraction + phases[k]));
    }
    return sum;
  }

  /** Extremes of w over one fundamental period: dense grid, then golden-section refinement. */
  private waveformExtremes(): { max: number; min: number } {
    const grid = 4096;
    let iMax = 0;
    let iMin = 0;
    let vMax = -Infinity;
    let vMin = Infinity;
    for (let i = 0; i < grid; i++) {
      const v = this.waveformAtCycles(i / grid);
      if (v > vMax) [vMax, iMax] = [v, i];
      if (v < vMin) [vMin, iMin] = [v, i];
    }
    const refine = (centre: number, sign: number): number => {
      let a = (centre - 1) / grid;
      let b = (centre + 1) / grid;
      const ratio = (Math.sqrt(5) - 1) / 2;
      for (let it = 0; it < 60; it++) {
        const c = b - ratio * (b - a);
        const d = a + ratio * (b - a);
        if (sign * this.waveformAtCycles(c) > sign * this.waveformAtCycles(d)) b = d;
        else a = c;
      }
      return this.waveformAtCycles((a + b) / 2);
    };
    return { max: Math.max(vMax, refine(iMax, 1)), min: Math.min(vMin, refine(iMin, -1)) };
  }
}
