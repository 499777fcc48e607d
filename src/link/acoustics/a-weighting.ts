/**
 * Frequency weighting A of sound level meters, IEC 61672-1 (Annex E closed form):
 *   R_A(f) = f4²·f⁴ / ((f² + f1²)·√((f² + f2²)(f² + f3²))·(f² + f4²)),
 *   A(f) = 20·log10 R_A(f) − A1000, normalised to 0 dB at 1 kHz,
 * with pole frequencies f1 = 20.598997, f2 = 107.65265, f3 = 737.86223, f4 = 12194.217 Hz.
 */

const F1_SQUARED = 20.598997 ** 2;
const F2_SQUARED = 107.65265 ** 2;
const F3_SQUARED = 737.86223 ** 2;
const F4_SQUARED = 12194.217 ** 2;

function unnormalisedGain(hertz: number): number {
  const f2 = hertz * hertz;
  return (F4_SQUARED * f2 * f2) / ((f2 + F1_SQUARED) * Math.sqrt((f2 + F2_SQUARED) * (f2 + F3_SQUARED)) * (f2 + F4_SQUARED));
}

const GAIN_AT_1KHZ = unnormalisedGain(1000);

/** Amplitude gain of the A weighting at `hertz` (1 at 1 kHz). */
export function aWeightingGain(hertz: number): number {
  return unnormalisedGain(hertz) / GAIN_AT_1KHZ;
}

/** A weighting in decibels at `hertz` (0 dB at 1 kHz). */
export function aWeightingDb(hertz: number): number {
  return 20 * Math.log10(aWeightingGain(hertz));
}

/**
 * ∫ |A(f)|² df over [lowHertz, highHertz] in hertz: the noise bandwidth of the A
 * weighting, so that white noise of one-sided density S reads S·bandwidth as
 * A-weighted mean square. Composite Simpson's rule on a logarithmic frequency axis.
 */
export function aWeightedNoiseBandwidthHertz(lowHertz = 20, highHertz = 20000, intervals = 4096): number {
  const logLow = Math.log(lowHertz);
  const step = (Math.log(highHertz) - logLow) / intervals;
  let sum = 0;
  for (let i = 0; i <= intervals; i++) {
    const f = Math.exp(logLow + i * step);
    const g = aWeightingGain(f);
    const integrand = g * g * f; // df = f·d(ln f)
    const weight = i === 0 || i === intervals ? 1 : i % 2 === 1 ? 4 : 2;
    sum += weight * integrand;
  }
  return (sum * step) / 3;
}
