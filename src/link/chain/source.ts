import { pinkNoise } from '../../audio/signals/pink-noise.ts';
import { speechLike } from '../../audio/signals/speech-like.ts';
import { expSweep } from '../../audio/signals/sweep.ts';
import { tone } from '../../audio/signals/tone.ts';
import { twoTone } from '../../audio/signals/two-tone.ts';
import { activeSpeechLevel, type SpeechLevel } from '../../audio/speech-level.ts';
import { resample } from '../../audio/resample.ts';
import { InputError } from '../../errors.ts';
import type { SourceLevel, SourceSettings } from '../../scenario/types.ts';
import { dbSplToPascals, speechLevelDbSpl } from '../acoustics/sound-level.ts';

/** Raised-cosine fade at both ends of the test signals (against clicks), seconds. */
const FADE_SECONDS = 0.01;

/** A recording as decoded: samples at their own rate. */
export interface Recording {
  samples: Float64Array;
  sampleRateHertz: number;
  label: string;
}

/** The sound pressure at the microphone, calibrated, at the chain's audio rate. */
export interface CalibratedSource {
  /** The samples; empty when the source is streamed (source-stream.ts) rather than held. */
  pascals: Float64Array;
  /** How many samples the source has (pascals.length when held). */
  samples: number;
  /** Largest |pressure| and the sum of squared pressures over the whole source (for the report). */
  peakPascals: number;
  sumSquaresPascals: number;
  /** The level asked for, dB SPL. */
  targetDbSpl: number;
  /** How the level was measured: active speech level (ITU-T P.56) or plain rms. */
  levelMeasure: 'active-speech-level' | 'rms';
  /** Activity factor of speech (P.56), null for test signals. */
  activityFactor: number | null;
}

/** The target level at the microphone in dB SPL. */
export function targetLevelDbSpl(level: SourceLevel): number {
  return level.kind === 'spl' ? level.dbSpl : speechLevelDbSpl(level.effort, level.distanceMetres);
}

/**
 * Builds the source signal and scales it so its level at the microphone is
 * the one asked for: speech (recordings, speech-like) by its active speech
 * level, test signals by their rms.
 */
export function calibratedSource(settings: SourceSettings, sampleRateHertz: number, recording?: Recording): CalibratedSource {
  const unit = 1; // generators give unit peak; calibration scales afterwards
  let raw: Float64Array;
  let speech = false;
  switch (settings.kind) {
    case 'recording': {
      if (!recording) throw new InputError('source.file', 'a recording to be supplied', `no samples were loaded for ${settings.file}`);
      raw =
        recording.sampleRateHertz === sampleRateHertz ? recording.samples : resample(recording.samples, recording.sampleRateHertz, sampleRateHertz);
      speech = true;
      break;
    }
    case 'tone':
      raw = tone({ sampleRateHertz, frequencyHertz: settings.frequencyHertz, peakAmplitude: unit, seconds: settings.seconds, fadeSeconds: FADE_SECONDS });
      break;
    case 'two-tone':
      raw = twoTone({ sampleRateHertz, seconds: settings.seconds, peakAmplitude: unit, tones: settings.preset, fadeSeconds: FADE_SECONDS });
      break;
    case 'sweep':
      raw = expSweep({
        sampleRateHertz,
        startHertz: settings.startHertz,
        endHertz: settings.endHertz,
        seconds: settings.seconds,
        peakAmplitude: unit,
        fadeSeconds: FADE_SECONDS,
      });
      break;
    case 'pink-noise':
      raw = pinkNoise({ sampleRateHertz, seconds: settings.seconds, rmsAmplitude: unit, seed: settings.seed });
      break;
    case 'speech-like':
      raw = speechLike({ sampleRateHertz, seconds: settings.seconds, rmsAmplitude: unit, seed: settings.seed });
      speech = true;
      break;
  }
  const targetDbSpl = targetLevelDbSpl(settings.level);
  const targetPascals = dbSplToPascals(targetDbSpl);
  let measuredRms: number;
  let activityFactor: number | null = null;
  if (speech) {
    const level = activeSpeechLevel(raw, sampleRateHertz);
    measuredRms = speechRms(level);
    activityFactor = level.activityFactor;
  } else {
    // The level of a test signal is its steady rms: the fades at the ends do not count.
    const fade = Math.min(Math.round(FADE_SECONDS * sampleRateHertz), Math.floor(raw.length / 4));
    let sum = 0;
    for (let i = fade; i < raw.length - fade; i++) sum += raw[i] * raw[i];
    measuredRms = Math.sqrt(sum / Math.max(1, raw.length - 2 * fade));
    if (!(measuredRms > 0)) throw new InputError('source', 'a test signal with some level', 'it is silent');
  }
  const gain = targetPascals / measuredRms;
  const pascals = new Float64Array(raw.length);
  let sumSquaresPascals = 0;
  let peakPascals = 0;
  for (let i = 0; i < raw.length; i++) {
    const p = raw[i] * gain;
    pascals[i] = p;
    sumSquaresPascals += p * p;
    peakPascals = Math.max(peakPascals, Math.abs(p));
  }
  return {
    pascals,
    samples: pascals.length,
    peakPascals,
    sumSquaresPascals,
    targetDbSpl,
    levelMeasure: speech ? 'active-speech-level' : 'rms',
    activityFactor,
  };
}

/** The rms that speech is scaled by: its active level (P.56) as a linear rms. */
export function speechRms(level: SpeechLevel): number {
  if (!Number.isFinite(level.activeLevelDb)) throw new InputError('source', 'a recording with some sound in it', 'it is digital silence');
  return 10 ** (level.activeLevelDb / 20);
}
