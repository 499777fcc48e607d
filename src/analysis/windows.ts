/**
 * Spectral-analysis windows, all in the periodic ("DFT-even") form that
 * Harris recommends for spectral analysis: w[n] = Σ_k (−1)^k a_k cos(2πkn/L),
 * n = 0..L−1 (F. J. Harris, "On the use of windows for harmonic analysis with
 * the discrete Fourier transform", Proc. IEEE 66(1), 51–83, 1978).
 *
 * - rectangular: only for coherent sampling (an integer number of cycles of
 *   every tone in the record); otherwise its −13 dB sidelobes leak.
 * - hann: a0 = a1 = 0.5 (Harris 1978); −31.5 dB sidelobes, ENBW 1.5 bins.
 * - blackman-harris: the minimum 4-term Blackman–Harris window, highest
 *   sidelobe −92 dB, ENBW 2.0044 bins (Harris 1978, Table 1). The default for
 *   harmonic measurement: a tone's power summed over ±5 bins is exact to ~1e−9
 *   wherever the tone falls between bins.
 * - flat-top: HFT95 (G. Heinzel, A. Rüdiger, R. Schilling, "Spectrum and
 *   spectral density estimation by the Discrete Fourier transform (DFT),
 *   including a comprehensive list of window functions and some new flat-top
 *   windows", Max-Planck-Institut für Gravitationsphysik, 2002, sec. D.3):
 *   highest sidelobe −95 dB, ENBW 3.8112 bins, amplitude flatness 0.0044 dB;
 *   read a single peak bin to within 0.0044 dB without power summation.
 * The coefficients are checked in test/analysis/windows.test.ts against those
 * papers' sidelobe, ENBW and flatness figures.
 */
import { InputError } from '../errors.ts';

export const WINDOW_KINDS = ['rectangular', 'hann', 'blackman-harris', 'flat-top'] as const;
export type WindowKind = (typeof WINDOW_KINDS)[number];

interface WindowFacts {
  /** Cosine-series coefficients a_k (signs alternate in use). */
  readonly coefficients: readonly number[];
  /** Half width of the main lobe in bins (first null for the cosine-sum windows). */
  readonly mainLobeHalfWidthBins: number;
}

const FACTS: Record<WindowKind, WindowFacts> = {
  rectangular: { coefficients: [1], mainLobeHalfWidthBins: 1 },
  hann: { coefficients: [0.5, 0.5], mainLobeHalfWidthBins: 2 },
  'blackman-harris': { coefficients: [0.35875, 0.48829, 0.14128, 0.01168], mainLobeHalfWidthBins: 4 },
  'flat-top': {
    coefficients: [1, 1.9383379, 1.3045202, 0.402827, 0.0350665],
    mainLobeHalfWidthBins: 5,
  },
};

/**
 * The last few windows made: a Welch average asks for the same window once per segment, and its
 * cosines cost more than the rest of the segment's work but the FFT. Copies go out, so no caller
 * can change what the next one gets.
 */
const MADE = new Map<string, Float64Array>();
const MAX_MADE = 8;
/** Longer windows (a whole record's) are made afresh: memory, not time, is what they would cost kept. */
const MAX_KEPT_LENGTH = 1 << 16;

/** Periodic window of `length` samples. */
export function windowCoefficients(kind: WindowKind, length: number): Float64Array {
  const facts = FACTS[kind];
  if (!facts) throw new InputError('window', `one of ${WINDOW_KINDS.join(', ')}`, `got ${String(kind)}`);
  if (!Number.isInteger(length) || length < 1) {
    throw new InputError('window length', 'a positive whole number of samples', `got ${length}`);
  }
  if (length > MAX_KEPT_LENGTH) return cosineSum(facts.coefficients, length);
  const key = `${kind} ${length}`;
  let made = MADE.get(key);
  if (!made) {
    made = cosineSum(facts.coefficients, length);
    if (MADE.size >= MAX_MADE) MADE.delete(MADE.keys().next().value as string);
    MADE.set(key, made);
  }
  return made.slice();
}

function cosineSum(a: readonly number[], length: number): Float64Array {
  const w = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    let sum = a[0];
    for (let k = 1; k < a.length; k++) {
      const sign = k % 2 === 1 ? -1 : 1;
      sum += sign * a[k] * Math.cos((2 * Math.PI * k * n) / length);
    }
    w[n] = sum;
  }
  return w;
}

/** Half width of the window's main lobe, in bins of the unpadded record. */
export function mainLobeHalfWidthBins(kind: WindowKind): number {
  return FACTS[kind].mainLobeHalfWidthBins;
}

/** Equivalent noise bandwidth in bins: L·Σw² / (Σw)² (Harris 1978, eq. 11). */
export function equivalentNoiseBandwidthBins(window: Float64Array): number {
  let sum = 0;
  let sumSquares = 0;
  for (let n = 0; n < window.length; n++) {
    sum += window[n];
    sumSquares += window[n] * window[n];
  }
  return (window.length * sumSquares) / (sum * sum);
}
