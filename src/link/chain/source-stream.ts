/**
 * A recording fed to the chain as a stream, for inputs too long to hold (an hour of
 * 48 kHz audio is 1.4 GB as float64, several times that through decode, resampling
 * and calibration). The level is a property of the whole recording, so it is measured
 * first, in passes over the file (peak and energy, then the P.56 envelope counts:
 * activeSpeechLevelOf); the render then pulls calibrated chunks. Each pass decodes and
 * resamples afresh (StreamResampler gives resample()'s output exactly), so the chunks
 * equal calibratedSource's array sample for sample and the far end is the same.
 */
import { resampledLength } from '../../audio/resample.ts';
import { StreamResampler } from '../../audio/resample-stream.ts';
import { activeSpeechLevelOf, SpeechEnergy } from '../../audio/speech-level.ts';
import { InputError } from '../../errors.ts';
import type { SourceSettings } from '../../scenario/types.ts';
import { dbSplToPascals } from '../acoustics/sound-level.ts';
import { calibratedSource, speechRms, targetLevelDbSpl, type CalibratedSource, type Recording } from './source.ts';

/** Mono frames of a recording, readable again from the start (WavFrameReader is one). */
export interface FrameSource {
  readonly label: string;
  readonly sampleRateHertz: number;
  readonly frames: number;
  /** Back to the first frame. */
  rewind(): void;
  /** Fills `mono` with the next frames; returns how many (0 at the end). */
  read(mono: Float64Array): number;
}

/** The calibration of a streamed recording: plain data, so it can go to another thread. */
export interface SourceCalibration extends Omit<CalibratedSource, 'pascals'> {
  /** Pascals per unit of the recording at the chain's rate. */
  gain: number;
}

/** A recording read as a stream. */
export interface StreamedRecording {
  frames: FrameSource;
  /** The file it reads, so another thread can open it again (the pipelined render). */
  file?: string;
  /** Its calibration when already measured; else measured by passes before the render. */
  calibration?: SourceCalibration;
}

/** What the transmitter stage is given for its source: none, a decoded recording, or a stream. */
export type SourceInput = Recording | StreamedRecording | undefined;

/** Hands out the calibrated source in order: `read` fills `out` with the next samples. */
export interface PascalsReader {
  read(out: Float64Array): void;
}

const BLOCK_FRAMES = 8192;

/** One pass over the recording at the chain's rate: `take` gets its chunks in order. */
function resampledPass(frames: FrameSource, sampleRateHertz: number, take: (chunk: Float64Array) => void): void {
  frames.rewind();
  const block = new Float64Array(BLOCK_FRAMES);
  const resampler = frames.sampleRateHertz === sampleRateHertz ? null : new StreamResampler(frames.sampleRateHertz, sampleRateHertz);
  for (;;) {
    const got = frames.read(block);
    if (got === 0) break;
    const chunk = block.subarray(0, got);
    take(resampler ? resampler.push(chunk) : chunk);
  }
  if (resampler) take(resampler.finish());
}

/** Samples of the recording at the chain's rate (as resample() gives). */
export function streamedSamples(frames: FrameSource, sampleRateHertz: number): number {
  return frames.sampleRateHertz === sampleRateHertz ? frames.frames : resampledLength(frames.frames, frames.sampleRateHertz, sampleRateHertz);
}

/**
 * Measures a streamed recording's level in two passes and returns the gain that
 * brings it to the scenario's level: the same gain as calibratedSource on the
 * decoded recording, and the figures the report needs.
 */
export function calibrateRecording(settings: SourceSettings, sampleRateHertz: number, frames: FrameSource): SourceCalibration {
  if (settings.kind !== 'recording') throw new InputError('source.kind', '"recording" when a recording is streamed', `got "${settings.kind}"`);
  const energy = new SpeechEnergy();
  let passes = 0;
  const level = activeSpeechLevelOf(sampleRateHertz, (take) => {
    const first = passes++ === 0;
    resampledPass(frames, sampleRateHertz, (chunk) => {
      if (first) energy.push(chunk);
      take(chunk);
    });
  });
  const targetDbSpl = targetLevelDbSpl(settings.level);
  const gain = dbSplToPascals(targetDbSpl) / speechRms(level);
  return {
    gain,
    samples: energy.count,
    // max |x·g| is g·max|x| exactly (rounding is monotonic); the squares differ from Σ(x·g)² in the last bits only.
    peakPascals: energy.peak * gain,
    sumSquaresPascals: energy.sumSquares * gain * gain,
    targetDbSpl,
    levelMeasure: 'active-speech-level',
    activityFactor: level.activityFactor,
  };
}

/** The calibrated pressure of a streamed recording, chunk by chunk, from its start. */
class StreamedPascals implements PascalsReader {
  private readonly block = new Float64Array(BLOCK_FRAMES);
  private readonly resampler: StreamResampler | null;
  private pending: Float64Array = new Float64Array(0);
  private pendingAt = 0;
  private ended = false;

  constructor(
    private readonly frames: FrameSource,
    sampleRateHertz: number,
    private readonly gain: number,
  ) {
    frames.rewind();
    this.resampler = frames.sampleRateHertz === sampleRateHertz ? null : new StreamResampler(frames.sampleRateHertz, sampleRateHertz);
  }

  read(out: Float64Array): void {
    const gain = this.gain;
    let filled = 0;
    while (filled < out.length) {
      const take = Math.min(out.length - filled, this.pending.length - this.pendingAt);
      if (take > 0) {
        const pending = this.pending;
        const at = this.pendingAt;
        for (let i = 0; i < take; i++) out[filled + i] = pending[at + i] * gain;
        filled += take;
        this.pendingAt += take;
        continue;
      }
      this.refill();
    }
  }

  /** The next resampled samples (the resampler's view stays valid until its next call). */
  private refill(): void {
    const got = this.ended ? 0 : this.frames.read(this.block);
    this.pendingAt = 0;
    if (got > 0) {
      const chunk = this.block.subarray(0, got);
      this.pending = this.resampler ? this.resampler.push(chunk) : chunk;
    } else if (!this.ended) {
      this.ended = true;
      this.pending = this.resampler ? this.resampler.finish() : new Float64Array(0);
    } else {
      throw new InputError(this.frames.label, `${this.frames.frames} frames`, 'the recording ended early');
    }
  }
}

/** The held source, chunk by chunk. */
function arrayReader(pascals: Float64Array): PascalsReader {
  let position = 0;
  return {
    read(out) {
      out.set(pascals.subarray(position, position + out.length));
      position += out.length;
    },
  };
}

/** The calibrated source for the transmitter stage and a reader for its samples. */
export function openSource(settings: SourceSettings, sampleRateHertz: number, input: SourceInput): { calibrated: CalibratedSource; reader: PascalsReader } {
  if (input === undefined || !('frames' in input)) {
    const calibrated = calibratedSource(settings, sampleRateHertz, input);
    return { calibrated, reader: arrayReader(calibrated.pascals) };
  }
  const { gain, ...figures } = input.calibration ?? calibrateRecording(settings, sampleRateHertz, input.frames);
  const samples = streamedSamples(input.frames, sampleRateHertz);
  if (figures.samples !== samples) {
    throw new InputError(input.frames.label, `the recording that was calibrated (${figures.samples} samples)`, `it now gives ${samples}`);
  }
  return { calibrated: { pascals: new Float64Array(0), ...figures }, reader: new StreamedPascals(input.frames, sampleRateHertz, gain) };
}
