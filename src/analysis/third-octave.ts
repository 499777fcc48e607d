/**
 * One-third-octave band levels. Bands follow IEC 61260-1:2014 with the base-ten
 * ratio G = 10^(3/10): exact mid-band frequencies fm = 1000·G^(x/3) =
 * 1000·10^(x/10) Hz and band edges fm·10^(∓1/20). The level of a band is the
 * mean square of the signal's power spectrum summed over the bins whose
 * centres fall inside it (spectrum.ts, Blackman–Harris window), in dB re 1
 * signal unit squared (dBFS for full-scale samples).
 */
import { powerDb } from './decibels.ts';
import { bandPower, powerSpectrum } from './spectrum.ts';

export interface ThirdOctaveBand {
  /** Exact mid-band frequency 1000·10^(x/10). */
  centreHertz: number;
  lowHertz: number;
  highHertz: number;
}

/** Bands whose centres lie in [lowestHertz, highestHertz] and whose upper edge is below `nyquistHertz`. */
export function thirdOctaveBands(lowestHertz: number, highestHertz: number, nyquistHertz: number): ThirdOctaveBand[] {
  const bands: ThirdOctaveBand[] = [];
  const first = Math.ceil(10 * Math.log10(lowestHertz / 1000) - 1e-9);
  const last = Math.floor(10 * Math.log10(highestHertz / 1000) + 1e-9);
  for (let x = first; x <= last; x++) {
    const centreHertz = 1000 * 10 ** (x / 10);
    const band = { centreHertz, lowHertz: centreHertz * 10 ** (-1 / 20), highHertz: centreHertz * 10 ** (1 / 20) };
    if (band.highHertz < nyquistHertz) bands.push(band);
  }
  return bands;
}

/** Level of each band in dB (floored at −300 dB for silence). */
export function thirdOctaveLevelsDb(samples: ArrayLike<number>, rateHertz: number, bands: readonly ThirdOctaveBand[]): Float64Array {
  const spectrum = powerSpectrum(samples, rateHertz, { window: 'blackman-harris' });
  return Float64Array.from(bands, (band) => powerDb(bandPower(spectrum, band.lowHertz, band.highHertz)));
}
