/**
 * Signal-to-noise ratio of a system's output from its input, by coherence:
 * the output power spectrum G_yy splits into the part linearly related to
 * the input, γ²·G_yy ("coherent output power"), and the rest, (1 − γ²)·G_yy
 * (noise and distortion), with γ² = |G_xy|² / (G_xx·G_yy) the magnitude-
 * squared coherence (J. S. Bendat & A. G. Piersol, Random Data: Analysis
 * and Measurement Procedures, Wiley, ch. "single-input/single-output
 * relationships", coherent output power; from memory). Unlike a waveform
 * difference, it is not spoiled by the link's own frequency and phase
 * response, so it is the SNR of a link budget.
 *
 * Spectra by Welch's method: Hann-windowed segments, 50 % overlap. Segments
 * must be long against the system's own impulse response, or the part of the
 * output that spills from one segment into the next reads as incoherent: on
 * demo (a) speech read 24 dB with 21 ms segments, 30 dB with 85 ms and 31 dB
 * with 340 ms. The default is about 85 ms (a power of two), shortened only
 * when the record would give fewer than 8 segments. With n
 * segments an estimated γ² is biased upwards by about (1 − γ²)²/n; where it
 * matters (γ² near 0) the estimate is corrected to (n·γ² − 1)/(n − 1),
 * floored at 0 (the expected estimate for true γ² = 0 is 1/n; from memory).
 * Summed over the band, SNR = Σ γ²G_yy / Σ (1 − γ²)G_yy.
 */
import { InputError } from '../errors.ts';
import { powerDb } from './decibels.ts';
import { fftPlan, nextPowerOfTwo } from './fft.ts';
import { checkRate, checkSamples } from './validate.ts';
import { windowCoefficients } from './windows.ts';

export interface CoherentSnrOptions {
  /** Segment length (power of two); default about 85 ms, fewer samples when the record is short. */
  segmentSamples?: number;
  /** Band summed; default 20 Hz to 20 kHz (or Nyquist). */
  lowHertz?: number;
  highHertz?: number;
}

export interface CoherentSnr {
  snrDb: number;
  segments: number;
  segmentSamples: number;
  coherentPower: number;
  incoherentPower: number;
}

export function coherentSnr(input: ArrayLike<number>, output: ArrayLike<number>, rateHertz: number, options: CoherentSnrOptions = {}): CoherentSnr {
  checkRate('rateHertz', rateHertz);
  const length = Math.min(input.length, output.length);
  const size = options.segmentSamples ?? defaultSegment(length, rateHertz);
  checkSamples('input', input, size);
  checkSamples('output', output, size);
  const hop = size / 2;
  const segments = Math.floor((length - size) / hop) + 1;
  if (segments < 2) throw new InputError('input', `at least ${size + hop} samples for two ${size}-sample segments`, `got ${length}`);
  const plan = fftPlan(size);
  const window = windowCoefficients('hann', size);
  const bins = size / 2 + 1;
  const sxx = new Float64Array(bins);
  const syy = new Float64Array(bins);
  const sxyRe = new Float64Array(bins);
  const sxyIm = new Float64Array(bins);
  const xs = new Float64Array(size);
  const ys = new Float64Array(size);
  const fx = new Float64Array(2 * size);
  const fy = new Float64Array(2 * size);
  for (let s = 0; s < segments; s++) {
    const start = s * hop;
    let meanX = 0;
    let meanY = 0;
    for (let i = 0; i < size; i++) {
      meanX += input[start + i];
      meanY += output[start + i];
    }
    meanX /= size;
    meanY /= size;
    for (let i = 0; i < size; i++) {
      xs[i] = (input[start + i] - meanX) * window[i];
      ys[i] = (output[start + i] - meanY) * window[i];
    }
    plan.realTransform(fx, xs);
    plan.realTransform(fy, ys);
    for (let k = 0; k < bins; k++) {
      const xr = fx[2 * k];
      const xi = fx[2 * k + 1];
      const yr = fy[2 * k];
      const yi = fy[2 * k + 1];
      sxx[k] += xr * xr + xi * xi;
      syy[k] += yr * yr + yi * yi;
      // conj(X)·Y
      sxyRe[k] += xr * yr + xi * yi;
      sxyIm[k] += xr * yi - xi * yr;
    }
  }
  const binHertz = rateHertz / size;
  const low = Math.max(1, Math.ceil((options.lowHertz ?? 20) / binHertz));
  const high = Math.min(bins - 2, Math.floor(Math.min(options.highHertz ?? 20000, rateHertz / 2) / binHertz));
  let coherent = 0;
  let incoherent = 0;
  for (let k = low; k <= high; k++) {
    const denominator = sxx[k] * syy[k];
    const raw = denominator > 0 ? (sxyRe[k] * sxyRe[k] + sxyIm[k] * sxyIm[k]) / denominator : 0;
    const gamma2 = Math.min(1, Math.max(0, (segments * raw - 1) / (segments - 1)));
    coherent += gamma2 * syy[k];
    incoherent += (1 - gamma2) * syy[k];
  }
  if (!(coherent + incoherent > 0)) throw new InputError('output', 'a signal with some content in the band', 'it is silent there');
  return { snrDb: Math.min(300, powerDb(coherent / incoherent)), segments, segmentSamples: size, coherentPower: coherent, incoherentPower: incoherent };
}

/** About 85 ms, halved while the record would give fewer than 8 half-overlapped segments (not below 256 samples). */
function defaultSegment(length: number, rateHertz: number): number {
  let size = nextPowerOfTwo(Math.round(0.085 * rateHertz));
  while (size > 256 && Math.floor((length - size) / (size / 2)) + 1 < 8) size /= 2;
  return size;
}
