/**
 * Spectra for the page: averaged over segments (Welch's method: P. D. Welch,
 * IEEE Trans. Audio Electroacoust. AU-15, 1967) with the analysis core's
 * power spectrum per segment, then reduced to log-spaced bands so a plot
 * holds a few hundred points whatever the record length.
 */
import { powerSpectrum } from '../analysis/index.ts';
import type { DisplaySpectrum } from './messages.ts';

const SEGMENT_SAMPLES = 16384;
/** Enough segments for a smooth average; more only costs time. */
const MAX_SEGMENTS = 96;
const BANDS_PER_OCTAVE = 24;
const LOWEST_HERTZ = 20;

export function displaySpectrum(name: string, samples: ArrayLike<number>, rateHertz: number): DisplaySpectrum {
  const length = Math.min(SEGMENT_SAMPLES, samples.length);
  const hop = length / 2;
  const available = Math.max(1, Math.floor((samples.length - length) / hop) + 1);
  const count = Math.min(available, MAX_SEGMENTS);
  // Segments spread evenly over the record when there are more than we use.
  const stride = count > 1 ? (samples.length - length) / (count - 1) : 0;
  const segment = new Float64Array(length);
  let average: Float64Array | null = null;
  let binHertz = 0;
  for (let s = 0; s < count; s++) {
    const start = Math.round(s * stride);
    for (let i = 0; i < length; i++) segment[i] = samples[start + i];
    const spectrum = powerSpectrum(segment, rateHertz, { window: 'hann' });
    binHertz = spectrum.binHertz;
    if (!average) average = new Float64Array(spectrum.meanSquare.length);
    for (let k = 0; k < average.length; k++) average[k] += spectrum.meanSquare[k] / count;
  }
  const meanSquare = average ?? new Float64Array(1);
  let total = 0;
  for (let k = 1; k < meanSquare.length; k++) total += meanSquare[k];

  const topHertz = Math.min(rateHertz / 2, 24000);
  const bandCount = Math.max(1, Math.floor(Math.log2(topHertz / LOWEST_HERTZ) * BANDS_PER_OCTAVE));
  const hertz = new Float64Array(bandCount);
  const levelDb = new Float64Array(bandCount);
  for (let b = 0; b < bandCount; b++) {
    const low = LOWEST_HERTZ * 2 ** (b / BANDS_PER_OCTAVE);
    const high = LOWEST_HERTZ * 2 ** ((b + 1) / BANDS_PER_OCTAVE);
    let first = Math.max(1, Math.ceil(low / binHertz));
    let last = Math.min(meanSquare.length - 1, Math.floor(high / binHertz));
    if (last < first) first = last = Math.min(meanSquare.length - 1, Math.max(1, Math.round(Math.sqrt(low * high) / binHertz)));
    let strongest = 0;
    for (let k = first; k <= last; k++) strongest = Math.max(strongest, meanSquare[k]);
    hertz[b] = Math.sqrt(low * high);
    // −200 dB stands for silence: a plot cannot draw −∞.
    levelDb[b] = total > 0 && strongest > 0 ? Math.max(-200, 10 * Math.log10(strongest / total)) : -200;
  }
  return { name, hertz, levelDb };
}
