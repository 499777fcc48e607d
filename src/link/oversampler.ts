/**
 * Oversampling for the chain: the circuits run at an internal rate = audio rate × factor (2, 4, 8).
 * Both directions are cascades of 2× half-band stages (Kaiser-windowed sinc, linear phase), which
 * costs far less than one long filter at the internal rate. Every stage is flat to 0.45 × the audio
 * rate and rejects, by at least the design attenuation, everything that would land below 0.45 × the
 * audio rate after the rate change (see docs/time-base.md for the edges and the measured figures).
 * Latency is a whole number of audio-rate samples in each direction, so the chain can compensate.
 */
import { InputError } from '../errors.ts';
import { designHalfBand } from '../numeric/fir-design.ts';
import { HalfBandDownStage, HalfBandUpStage } from './half-band-stage.ts';

export type OversamplingFactor = 2 | 4 | 8;

/** Passband edge as a fraction of the audio rate. */
export const PASSBAND_EDGE_OF_AUDIO_RATE = 0.45;
/** Design stopband attenuation of every stage (Kaiser's formula; measured figures in the docs). */
export const STAGE_ATTENUATION_DB = 110;

function checkFactor(factor: number): OversamplingFactor {
  if (factor !== 2 && factor !== 4 && factor !== 8) {
    throw new InputError('oversampling factor', '2, 4 or 8', `got ${String(factor)}`);
  }
  return factor;
}

/**
 * Half-band taps for the stage whose high rate is `highRateOfAudio` × the audio rate. Its passband
 * edge is 0.45/R and its stopband edge 0.5 − 0.45/R cycles per high-rate sample, so what folds
 * over at this stage lands above 0.45 × the audio rate. `centreRemainder` fixes c mod R so that the
 * stage latency is a whole number of audio-rate samples.
 */
function stageTaps(highRateOfAudio: number, centreRemainder: number): Float64Array {
  return designHalfBand({
    transitionWidth: 0.5 - (2 * PASSBAND_EDGE_OF_AUDIO_RATE) / highRateOfAudio,
    attenuationDb: STAGE_ATTENUATION_DB,
    centreModulus: Math.max(2, highRateOfAudio),
    centreRemainder,
  });
}

/** Buffer `stage` of `scratches`, grown to at least `length` samples. */
function scratch(scratches: Float64Array[], stage: number, length: number): Float64Array {
  if (scratches[stage].length < length) scratches[stage] = new Float64Array(length);
  return scratches[stage];
}

/** Audio rate → internal rate. process() writes factor × input.length samples. */
export class Upsampler {
  readonly factor: OversamplingFactor;
  /** Output lags input by this many audio-rate samples (= latencyInternalSamples / factor). */
  readonly latencySamples: number;
  readonly latencyInternalSamples: number;
  private readonly stages: HalfBandUpStage[] = [];
  /** Each stage's output but the last, grown to the longest block so far. */
  private readonly scratches: Float64Array[] = [];

  constructor(factor: number) {
    this.factor = checkFactor(factor);
    let latency = 0;
    // Stage k raises R/2 → R; its latency (c+1)/2 at the lower rate is whole at the audio rate when c ≡ R−1 (mod R).
    for (let highRate = 2; highRate <= this.factor; highRate *= 2) {
      const stage = new HalfBandUpStage(stageTaps(highRate, highRate - 1));
      latency += (stage.latencyLowSamples * 2) / highRate;
      this.stages.push(stage);
    }
    this.latencySamples = latency;
    this.latencyInternalSamples = latency * this.factor;
    for (let s = 1; s < this.stages.length; s++) this.scratches.push(new Float64Array(0));
  }

  /** Filters `input` (audio rate) into `output` (internal rate); returns the count written. */
  process(input: Float64Array, output: Float64Array): number {
    const count = input.length * this.factor;
    if (output.length < count) {
      throw new InputError('upsampler output', `room for ${count} samples`, `got ${output.length}`);
    }
    // Stage by stage over the whole block, each into the next one's input.
    const last = this.stages.length - 1;
    let from = input;
    let n = input.length;
    for (let s = 0; s <= last; s++) {
      const to = s === last ? output : scratch(this.scratches, s, 2 * n);
      this.stages[s].process(from, n, to);
      from = to;
      n *= 2;
    }
    return count;
  }
}

/** Internal rate → audio rate. process() writes one sample per `factor` inputs, carrying the remainder. */
export class Decimator {
  readonly factor: OversamplingFactor;
  /** Output lags input by this many audio-rate samples (= latencyInternalSamples / factor). */
  readonly latencySamples: number;
  readonly latencyInternalSamples: number;
  private readonly stages: HalfBandDownStage[] = [];
  /** Each stage's output but the last, grown to the longest block so far. */
  private readonly scratches: Float64Array[] = [];
  private pending = 0;

  constructor(factor: number) {
    this.factor = checkFactor(factor);
    let latency = 0;
    // Stage k lowers R → R/2; its latency (c−1)/2 at the lower rate is whole at the audio rate when c ≡ 1 (mod R).
    for (let highRate = this.factor; highRate >= 2; highRate /= 2) {
      const stage = new HalfBandDownStage(stageTaps(highRate, 1));
      latency += (stage.latencyLowSamples * 2) / highRate;
      this.stages.push(stage);
    }
    this.latencySamples = latency;
    this.latencyInternalSamples = latency * this.factor;
    for (let s = 1; s < this.stages.length; s++) this.scratches.push(new Float64Array(0));
  }

  /** How many samples the next process() call will write for `inputLength` inputs. */
  outputLengthFor(inputLength: number): number {
    return Math.floor((this.pending + inputLength) / this.factor);
  }

  /** Filters `input` (internal rate) into `output` (audio rate); returns the count written. */
  process(input: Float64Array, output: Float64Array): number {
    const expected = this.outputLengthFor(input.length);
    if (output.length < expected) {
      throw new InputError('decimator output', `room for ${expected} samples`, `got ${output.length}`);
    }
    // Stage by stage over the whole block; each halves the count (carrying its own odd input).
    const last = this.stages.length - 1;
    let from = input;
    let n = input.length;
    for (let s = 0; s <= last; s++) {
      const to = s === last ? output : scratch(this.scratches, s, (n >> 1) + 1);
      n = this.stages[s].process(from, n, to);
      from = to;
    }
    this.pending = (this.pending + input.length) % this.factor;
    return n;
  }
}
