/**
 * Compares a degraded recording with its reference (e.g. a far end with the
 * clean source): the other is resampled to the reference's rate if needed,
 * aligned in time and matched in level by least squares (align.ts), then
 *   - STOI (stoi.ts, Taal et al. 2011) and segmental SNR (segmental-snr.ts)
 *     of the aligned other against the reference,
 *   - SNR by coherence (coherent-snr.ts): the part of the other linearly
 *     related to the reference over the rest, blind to equalisation,
 *   - rms levels of both as given and their difference,
 *   - one-third-octave band levels (third-octave.ts) of both as given, and
 *     of the aligned, level-matched other: the spectral difference once the
 *     overall gain is taken out.
 */
import { resample } from '../audio/resample.ts';
import { InputError } from '../errors.ts';
import { align } from './align.ts';
import { coherentSnr } from './coherent-snr.ts';
import { amplitudeDb } from './decibels.ts';
import { levels } from './levels.ts';
import { segmentalSnr } from './segmental-snr.ts';
import { stoi } from './stoi.ts';
import { thirdOctaveBands, thirdOctaveLevelsDb } from './third-octave.ts';

export interface CompareOptions {
  /** Largest delay searched either way; default 0.5 s. */
  maxLagSeconds: number;
  /** Centres of the lowest and highest third-octave bands; default 25 Hz and 20 kHz. */
  lowestBandHertz: number;
  highestBandHertz: number;
}

export const COMPARE_DEFAULTS: CompareOptions = { maxLagSeconds: 0.5, lowestBandHertz: 25, highestBandHertz: 20000 };

export interface BandComparison {
  centreHertz: number;
  referenceDb: number;
  otherDb: number;
  /** other − reference, both as given. */
  differenceDb: number;
  /** aligned and level-matched other − reference: the change in spectral shape. */
  matchedDifferenceDb: number;
}

export interface Comparison {
  rateHertz: number;
  referenceSeconds: number;
  otherSeconds: number;
  /** The other's own rate when it was resampled, else null. */
  otherResampledFromHertz: number | null;
  /** Delay of the other behind the reference (negative: ahead). */
  lagSeconds: number;
  /** Level-matching gain applied to the other, dB; `inverted` when its sign was negative. */
  matchGainDb: number;
  inverted: boolean;
  referenceRmsDb: number;
  otherRmsDb: number;
  levelDifferenceDb: number;
  stoi: number | null;
  segmentalSnrDb: number | null;
  /** Power of the other coherent with the reference over the rest (coherent-snr.ts). */
  snrDb: number | null;
  bands: BandComparison[];
  notes: string[];
}

export function compareRecordings(
  reference: { samples: Float64Array; rateHertz: number },
  other: { samples: Float64Array; rateHertz: number },
  options: CompareOptions = COMPARE_DEFAULTS,
): Comparison {
  const rate = reference.rateHertz;
  const resampled = other.rateHertz !== rate;
  const y = resampled ? resample(other.samples, other.rateHertz, rate) : other.samples;
  const x = reference.samples;
  const referenceLevels = levels(x);
  const otherLevels = levels(y);
  if (referenceLevels.rms === 0) throw new InputError('reference', 'a recording with some sound in it', 'it is digital silence');
  if (otherLevels.rms === 0) throw new InputError('other', 'a recording with some sound in it', 'it is digital silence');
  const alignment = align(x, y, rate, { maxLagSeconds: options.maxLagSeconds });
  const aligned = alignment.aligned;
  const notes: string[] = [];
  const measured = (name: string, f: () => number): number | null => {
    try {
      return f();
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      notes.push(`${name}: ${error.message}`);
      return null;
    }
  };
  const bands = thirdOctaveBands(options.lowestBandHertz, options.highestBandHertz, rate / 2);
  const referenceBands = thirdOctaveLevelsDb(x, rate, bands);
  const otherBands = thirdOctaveLevelsDb(y, rate, bands);
  const matchedBands = thirdOctaveLevelsDb(aligned, rate, bands);
  return {
    rateHertz: rate,
    referenceSeconds: x.length / rate,
    otherSeconds: other.samples.length / other.rateHertz,
    otherResampledFromHertz: resampled ? other.rateHertz : null,
    lagSeconds: alignment.lagSeconds,
    matchGainDb: amplitudeDb(Math.abs(alignment.gain)),
    inverted: alignment.gain < 0,
    referenceRmsDb: referenceLevels.rmsDb,
    otherRmsDb: otherLevels.rmsDb,
    levelDifferenceDb: otherLevels.rmsDb - referenceLevels.rmsDb,
    stoi: measured('STOI', () => stoi(x, aligned, rate)),
    segmentalSnrDb: measured('segmental SNR', () => segmentalSnr(x, aligned, rate, { activeOnly: true }).segmentalSnrDb),
    snrDb: measured('SNR', () => coherentSnr(x, aligned, rate, { highHertz: Math.min(20000, rate / 2) }).snrDb),
    bands: bands.map((band, i) => ({
      centreHertz: band.centreHertz,
      referenceDb: referenceBands[i],
      otherDb: otherBands[i],
      differenceDb: otherBands[i] - referenceBands[i],
      matchedDifferenceDb: matchedBands[i] - referenceBands[i],
    })),
    notes,
  };
}
