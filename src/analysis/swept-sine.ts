/**
 * Linear and harmonic responses from an exponential-sweep measurement
 * (A. Farina, "Simultaneous measurement of impulse response and distortion
 * with a swept-sine technique", AES 108th Convention, Paris 2000, preprint 5093).
 *
 * The recorded response is convolved (by FFT) with the sweep's inverse filter
 * (audio/signals/sweep.ts). The linear impulse response then sits at sample
 * N − 1 (N = sweep length) and the n-th harmonic's impulse response ahead of
 * it by Δt_n = T·ln(n)/ln(f2/f1): for the exponential sweep, the n-th harmonic
 * of the excitation is the excitation itself advanced by Δt_n (up to a
 * constant phase), so it deconvolves to an impulse response of its own.
 * Each is cut out with the same window (a short half-Hann fade-in before the
 * peak, flat, half-Hann fade-out; its length fits between the two closest
 * harmonic responses) and transformed. The excitation itself, deconvolved and
 * windowed the same way, is the reference: dividing by it removes the inverse
 * filter's band-edge ripple, so the result is the system's own response.
 *
 * The n-th harmonic response at output frequency F is the harmonic's
 * amplitude per unit excitation amplitude at excitation frequency F/n
 * (valid for F in [n·f1, f2]); it is reported against F/n, the excitation
 * frequency, in dB re the excitation amplitude and in dB re the linear
 * response at that frequency (dBc). Harmonics that alias above Nyquist are
 * not separated: keep n·f2 below Nyquist for clean harmonic results.
 */
import { expSweep, sweepInverseFilter, type SweepOptions } from '../audio/signals/sweep.ts';
import { InputError } from '../errors.ts';
import { amplitudeDb } from './decibels.ts';
import { fftConvolve, nextPowerOfTwo, realFft } from './fft.ts';
import { checkSamples } from './validate.ts';

export interface SweptSineOptions {
  /** Highest harmonic order to extract; default 5. */
  harmonicCount?: number;
  /** Window length for every response; default: the gap between the two closest harmonic responses. */
  windowSeconds?: number;
}

export interface FrequencyResponse {
  readonly order: number;
  /** Excitation frequency of each point. */
  readonly hertz: Float64Array;
  /** Output amplitude at this order per unit excitation amplitude, in dB. */
  readonly db: Float64Array;
  /** Relative to the linear response at the same excitation frequency (0 for order 1). */
  readonly dbc: Float64Array;
}

export interface SweptSineResult {
  /** Windowed linear impulse response (the window starts `preSamples` before sample N − 1). */
  readonly impulseResponse: Float64Array;
  readonly preSamples: number;
  readonly linear: FrequencyResponse;
  /** Orders 2..harmonicCount. */
  readonly harmonics: readonly FrequencyResponse[];
  readonly windowSeconds: number;
}

export function sweptSineResponse(recorded: Float64Array, sweep: SweepOptions, options: SweptSineOptions = {}): SweptSineResult {
  const excitation = expSweep(sweep);
  const inverse = sweepInverseFilter(sweep);
  checkSamples('recorded', recorded, excitation.length);
  const rate = sweep.sampleRateHertz;
  const harmonicCount = options.harmonicCount ?? 5;
  if (!Number.isInteger(harmonicCount) || harmonicCount < 1) {
    throw new InputError('harmonicCount', 'a whole number of at least 1', `got ${harmonicCount}`);
  }
  const sweepRate = Math.log(sweep.endHertz / sweep.startHertz) / sweep.seconds; // ln(f2/f1)/T
  const peak = excitation.length - 1;
  const advance = (order: number): number => Math.round((Math.log(order) / sweepRate) * rate);
  // The closest pair is the highest order and the one below it (at least 2 and 1).
  const top = Math.max(2, harmonicCount);
  const gap = advance(top) - advance(top - 1);
  const windowSamples = options.windowSeconds !== undefined ? Math.round(options.windowSeconds * rate) : gap;
  if (!(windowSamples >= 16) || windowSamples > gap) {
    throw new InputError(
      'windowSeconds',
      `between ${(16 / rate).toFixed(5)} and ${(gap / rate).toFixed(5)} s (the gap between harmonic ${top - 1} and ${top})`,
      `got ${windowSamples / rate} s`,
    );
  }
  if (advance(harmonicCount) + Math.floor(windowSamples / 8) > peak) {
    throw new InputError('harmonicCount', 'orders whose responses fit before the sweep start', `order ${harmonicCount} does not fit`);
  }
  const deconvolved = fftConvolve(recorded, inverse);
  const reference = fftConvolve(excitation, inverse);
  const preSamples = Math.floor(windowSamples / 8);
  const fadeOutSamples = Math.floor(windowSamples / 8);
  const window = responseWindow(windowSamples, preSamples, fadeOutSamples);
  const fftSize = Math.max(4096, nextPowerOfTwo(windowSamples));
  const binHertz = rate / fftSize;
  const referenceMagnitude = windowedMagnitude(reference, peak - preSamples, window, fftSize);

  const responses: FrequencyResponse[] = [];
  let linearDbAt: (hertz: number) => number = () => 0;
  let impulseResponse = new Float64Array(0);
  for (let order = 1; order <= harmonicCount; order++) {
    const start = peak - advance(order) - preSamples;
    if (order === 1) {
      impulseResponse = new Float64Array(windowSamples);
      for (let i = 0; i < windowSamples; i++) impulseResponse[i] = (deconvolved[start + i] ?? 0) * window[i];
    }
    const magnitude = windowedMagnitude(deconvolved, start, window, fftSize);
    // Output frequencies F with F in [n·f1, f2] (and clear of Nyquist).
    const lowBin = Math.ceil((order * sweep.startHertz) / binHertz);
    const highBin = Math.min(fftSize / 2 - 1, Math.floor(sweep.endHertz / binHertz));
    const count = Math.max(0, highBin - lowBin + 1);
    const hertz = new Float64Array(count);
    const db = new Float64Array(count);
    const dbc = new Float64Array(count);
    for (let i = 0; i < count; i++) {
      const k = lowBin + i;
      hertz[i] = (k * binHertz) / order;
      db[i] = amplitudeDb(magnitude[k] / referenceMagnitude[k]);
      dbc[i] = order === 1 ? 0 : db[i] - linearDbAt(hertz[i]);
    }
    const response = { order, hertz, db, dbc };
    if (order === 1) linearDbAt = (f) => interpolate(response.hertz, response.db, f);
    responses.push(response);
  }
  return { impulseResponse, preSamples, linear: responses[0], harmonics: responses.slice(1), windowSeconds: windowSamples / rate };
}

/** Half-Hann fade-in over `fadeIn` samples, flat, half-Hann fade-out over the last `fadeOut`. */
function responseWindow(length: number, fadeIn: number, fadeOut: number): Float64Array {
  const w = new Float64Array(length).fill(1);
  for (let i = 0; i < fadeIn; i++) w[i] = 0.5 - 0.5 * Math.cos((Math.PI * (i + 0.5)) / fadeIn);
  for (let i = 0; i < fadeOut; i++) w[length - 1 - i] = 0.5 - 0.5 * Math.cos((Math.PI * (i + 0.5)) / fadeOut);
  return w;
}

/** |DFT| of signal[start .. start + window.length) · window, zero-padded to fftSize. */
function windowedMagnitude(signal: Float64Array, start: number, window: Float64Array, fftSize: number): Float64Array {
  const segment = new Float64Array(window.length);
  for (let i = 0; i < window.length; i++) {
    const index = start + i;
    segment[i] = index >= 0 && index < signal.length ? signal[index] * window[i] : 0;
  }
  const spectrum = realFft(segment, fftSize);
  const magnitude = new Float64Array(fftSize / 2 + 1);
  for (let k = 0; k <= fftSize / 2; k++) magnitude[k] = Math.hypot(spectrum[2 * k], spectrum[2 * k + 1]);
  return magnitude;
}

/** Linear interpolation of y(x) on ascending x, held at the ends. */
function interpolate(x: Float64Array, y: Float64Array, at: number): number {
  if (x.length === 0) return 0;
  if (at <= x[0]) return y[0];
  if (at >= x[x.length - 1]) return y[x.length - 1];
  let low = 0;
  let high = x.length - 1;
  while (high - low > 1) {
    const mid = (low + high) >> 1;
    if (x[mid] <= at) low = mid;
    else high = mid;
  }
  const fraction = (at - x[low]) / (x[high] - x[low]);
  return y[low] + fraction * (y[high] - y[low]);
}
