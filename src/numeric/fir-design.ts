/**
 * Linear-phase lowpass FIR design by the window method: ideal lowpass (sinc) times a Kaiser window,
 * sized by Kaiser's formulas (see kaiser.ts). The passband and stopband deviation are equal (δ),
 * so a 100 dB stopband also means a passband ripple of ±20·log10(1 + 1e-5) ≈ ±0.0001 dB.
 */
import { kaiserBeta, kaiserOrder, kaiserWindow } from './kaiser.ts';

export interface LowpassSpec {
  /** Passband edge in cycles per sample (0 < edge < 0.5). */
  passbandEdge: number;
  /** Stopband edge in cycles per sample (passbandEdge < edge ≤ 0.5). */
  stopbandEdge: number;
  /** Stopband attenuation in dB (also sets the passband ripple, δ = 10^(−A/20)). */
  attenuationDb: number;
  /** Gain at DC; an interpolator by L wants L. Default 1. */
  gain?: number;
}

/** sin(πx)/(πx). */
export function sinc(x: number): number {
  if (x === 0) return 1;
  const px = Math.PI * x;
  return Math.sin(px) / px;
}

/**
 * Taps of a type-I (odd length, symmetric) lowpass with the cutoff midway between the edges.
 * The group delay is (length − 1)/2 samples, an integer.
 */
export function designLowpass(spec: LowpassSpec): Float64Array {
  const { passbandEdge, stopbandEdge, attenuationDb } = spec;
  const gain = spec.gain ?? 1;
  const transitionRadians = 2 * Math.PI * (stopbandEdge - passbandEdge);
  let order = kaiserOrder(attenuationDb, transitionRadians);
  if (order % 2 === 1) order += 1; // type I: even order, odd length
  const length = order + 1;
  const centre = order / 2;
  const cutoff = (passbandEdge + stopbandEdge) / 2;
  const window = kaiserWindow(length, kaiserBeta(attenuationDb));
  const taps = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    taps[n] = gain * 2 * cutoff * sinc(2 * cutoff * (n - centre)) * window[n];
  }
  return taps;
}

export interface HalfBandSpec {
  /** Transition width in cycles per sample, centred on 0.25 (passband edge 0.25 − w/2). */
  transitionWidth: number;
  attenuationDb: number;
  /**
   * The centre index c (= group delay) is the smallest odd c allowed by Kaiser's order formula
   * with c ≡ centreRemainder (mod centreModulus); oversampler stages use this to make their
   * latency a whole number of samples at the audio rate.
   */
  centreModulus?: number;
  centreRemainder?: number;
}

/**
 * Half-band lowpass (cutoff a quarter of the sample rate, DC gain 1): every tap at an even,
 * non-zero offset from the centre is exactly zero and the centre tap is exactly 1/2, so a 2×
 * polyphase split leaves one branch that is a pure delay.
 */
export function designHalfBand(spec: HalfBandSpec): Float64Array {
  const modulus = spec.centreModulus ?? 2;
  const remainder = spec.centreRemainder ?? 1;
  if (modulus % 2 !== 0 || remainder % 2 !== 1) {
    throw new RangeError('designHalfBand: the centre must be odd (even modulus, odd remainder)');
  }
  const minimumOrder = kaiserOrder(spec.attenuationDb, 2 * Math.PI * spec.transitionWidth);
  let centre = Math.ceil(minimumOrder / 2);
  while (((centre % modulus) + modulus) % modulus !== remainder % modulus) centre++;
  const length = 2 * centre + 1;
  const window = kaiserWindow(length, kaiserBeta(spec.attenuationDb));
  const taps = new Float64Array(length);
  for (let n = 0; n < length; n++) {
    const offset = n - centre;
    taps[n] = offset % 2 === 0 ? 0 : 0.5 * sinc(0.5 * offset) * window[n];
  }
  taps[centre] = 0.5;
  return taps;
}
