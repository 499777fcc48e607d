/**
 * One-sided power spectra scaled so that tones and noise can both be read:
 *
 *   meanSquare[k] = c_k·|X_k|² / (M·Σw²),  c_k = 2 except at DC and M/2,
 *
 * where X is the M-point DFT of the windowed record (length L ≤ M, zero
 * padded) and Σw² runs over the L window samples. By Parseval
 * (Σ_k |X_k|² = M·Σ_n (x_n w_n)²) the sum over all bins is the
 * window-weighted mean square of the record: white noise of variance σ²
 * sums to σ²·(band/Nyquist) over a band, and a tone of amplitude A sums to
 * A²/2 over its main lobe ("power summation"; Heinzel, Rüdiger & Schilling
 * 2002, sec. 10). Power summation over ±(lobe + 1) bins makes a tone's level
 * independent of where it falls between bins, so coherent sampling is not
 * required for accurate harmonic levels; with `coherent: true` the record is
 * used unwindowed and each tone is read from its single exact bin, which
 * requires a power-of-two record holding a whole number of cycles.
 */
import { InputError } from '../errors.ts';
import { isPowerOfTwo, nextPowerOfTwo, realFft } from './fft.ts';
import { checkRate, checkSamples } from './validate.ts';
import { mainLobeHalfWidthBins, windowCoefficients, type WindowKind } from './windows.ts';

export interface SpectrumOptions {
  /** Window; default 'blackman-harris' (ignored when coherent). */
  window?: WindowKind;
  /** Unwindowed exact-bin analysis; the record length must be a power of two. Default false. */
  coherent?: boolean;
  /** Subtract the record's mean first (keeps a large DC bias out of low bins). Default true. */
  removeMean?: boolean;
}

export interface PowerSpectrum {
  readonly rateHertz: number;
  /** DFT size M (power of two ≥ record length). */
  readonly fftSize: number;
  readonly recordLength: number;
  /** Spacing of the M-point bins. */
  readonly binHertz: number;
  /** Mean square per one-sided bin 0..M/2 (signal units squared). */
  readonly meanSquare: Float64Array;
  readonly window: WindowKind;
  readonly coherent: boolean;
  /** Bins summed either side of a tone's nearest bin (0 when coherent). */
  readonly toneHalfWidthBins: number;
}

export function powerSpectrum(samples: ArrayLike<number>, rateHertz: number, options: SpectrumOptions = {}): PowerSpectrum {
  checkSamples('samples', samples, 2);
  checkRate('rateHertz', rateHertz);
  const coherent = options.coherent ?? false;
  const window: WindowKind = coherent ? 'rectangular' : (options.window ?? 'blackman-harris');
  const length = samples.length;
  if (coherent && !isPowerOfTwo(length)) {
    throw new InputError('samples.length', 'a power of two for coherent analysis', `got ${length}`);
  }
  const fftSize = nextPowerOfTwo(length);
  const w = windowCoefficients(window, length);
  let mean = 0;
  if (options.removeMean ?? true) {
    for (let i = 0; i < length; i++) mean += samples[i];
    mean /= length;
  }
  const weighted = new Float64Array(length);
  let sumSquaresWindow = 0;
  for (let i = 0; i < length; i++) {
    weighted[i] = (samples[i] - mean) * w[i];
    sumSquaresWindow += w[i] * w[i];
  }
  const spectrum = realFft(weighted, fftSize);
  const half = fftSize / 2;
  const meanSquare = new Float64Array(half + 1);
  const scale = 1 / (fftSize * sumSquaresWindow);
  for (let k = 0; k <= half; k++) {
    const re = spectrum[2 * k];
    const im = spectrum[2 * k + 1];
    meanSquare[k] = (k === 0 || k === half ? 1 : 2) * (re * re + im * im) * scale;
  }
  const padding = fftSize / length;
  const toneHalfWidthBins = coherent ? 0 : Math.ceil((mainLobeHalfWidthBins(window) + 1) * padding);
  return { rateHertz, fftSize, recordLength: length, binHertz: rateHertz / fftSize, meanSquare, window, coherent, toneHalfWidthBins };
}

/** Nearest bin to `hertz`. */
export function binOf(spectrum: PowerSpectrum, hertz: number): number {
  return Math.round(hertz / spectrum.binHertz);
}

/** Highest frequency whose tone lobe lies wholly below Nyquist. */
export function highestToneHertz(spectrum: PowerSpectrum): number {
  return (spectrum.fftSize / 2 - spectrum.toneHalfWidthBins - 1) * spectrum.binHertz;
}

/**
 * Mean square of the tone at `hertz` (A²/2 for amplitude A) by power
 * summation over its lobe, or its single bin when coherent.
 */
export function tonePower(spectrum: PowerSpectrum, hertz: number): number {
  const centre = binOf(spectrum, hertz);
  const low = Math.max(0, centre - spectrum.toneHalfWidthBins);
  const high = Math.min(spectrum.meanSquare.length - 1, centre + spectrum.toneHalfWidthBins);
  let sum = 0;
  for (let k = low; k <= high; k++) sum += spectrum.meanSquare[k];
  return sum;
}

/** Peak amplitude of the tone at `hertz`. */
export function toneAmplitude(spectrum: PowerSpectrum, hertz: number): number {
  return Math.sqrt(2 * tonePower(spectrum, hertz));
}

/** Mean square in the bins whose centres lie in [lowHertz, highHertz]. */
export function bandPower(spectrum: PowerSpectrum, lowHertz: number, highHertz: number): number {
  const low = Math.max(0, Math.ceil(lowHertz / spectrum.binHertz));
  const high = Math.min(spectrum.meanSquare.length - 1, Math.floor(highHertz / spectrum.binHertz));
  let sum = 0;
  for (let k = low; k <= high; k++) sum += spectrum.meanSquare[k];
  return sum;
}

/**
 * Frequency of the strongest tone in [lowHertz, highHertz]: the peak bin,
 * refined by the power-weighted centroid of its lobe (exact bin when coherent).
 */
export function strongestToneHertz(spectrum: PowerSpectrum, lowHertz: number, highHertz: number): number {
  const low = Math.max(1, Math.ceil(lowHertz / spectrum.binHertz));
  const high = Math.min(spectrum.meanSquare.length - 1, Math.floor(highHertz / spectrum.binHertz));
  let peak = -1;
  for (let k = low; k <= high; k++) if (peak < 0 || spectrum.meanSquare[k] > spectrum.meanSquare[peak]) peak = k;
  if (peak < 0 || spectrum.meanSquare[peak] === 0) {
    throw new InputError('samples', `a tone between ${lowHertz} and ${highHertz} Hz`, 'found only silence');
  }
  if (spectrum.coherent) return peak * spectrum.binHertz;
  const from = Math.max(0, peak - spectrum.toneHalfWidthBins);
  const to = Math.min(spectrum.meanSquare.length - 1, peak + spectrum.toneHalfWidthBins);
  let weighted = 0;
  let total = 0;
  for (let k = from; k <= to; k++) {
    weighted += k * spectrum.meanSquare[k];
    total += spectrum.meanSquare[k];
  }
  return (weighted / total) * spectrum.binHertz;
}
