/**
 * Two summed sines for intermodulation tests. Presets (from memory, to be checked against the
 * standards before quoting): 'smpte' — 60 Hz and 7 kHz at 4:1 amplitude (SMPTE RP120 / DIN 45403
 * style); 'ccif' — 19 kHz and 20 kHz at equal amplitude (CCIF twin-tone, IEC 60268-3 difference-
 * frequency style).
 */
import { InputError } from '../../errors.ts';
import { applyFades, requireAudibleAt, requireNonNegative, requirePositive, sampleCount } from './arguments.ts';

export interface TwoToneFrequencies {
  lowHertz: number;
  highHertz: number;
  /** Amplitude of the low tone over that of the high tone. */
  lowToHighAmplitude: number;
}

export const TWO_TONE_PRESETS = {
  smpte: { lowHertz: 60, highHertz: 7000, lowToHighAmplitude: 4 },
  ccif: { lowHertz: 19000, highHertz: 20000, lowToHighAmplitude: 1 },
} as const satisfies Record<string, TwoToneFrequencies>;

export type TwoTonePreset = keyof typeof TWO_TONE_PRESETS;

export interface TwoToneOptions {
  sampleRateHertz: number;
  seconds: number;
  /** Peak of the sum = sum of the two amplitudes (both reach their crests together at some instant). */
  peakAmplitude: number;
  /** A preset name or custom frequencies. */
  tones: TwoTonePreset | TwoToneFrequencies;
  /** Raised-cosine fade at both ends; default 0. */
  fadeSeconds?: number;
}

export function twoTone(options: TwoToneOptions): Float64Array {
  const { sampleRateHertz, seconds, peakAmplitude } = options;
  const count = sampleCount(seconds, sampleRateHertz);
  requireNonNegative('peakAmplitude', peakAmplitude);
  let spec: TwoToneFrequencies;
  if (typeof options.tones === 'string') {
    if (!Object.hasOwn(TWO_TONE_PRESETS, options.tones)) {
      throw new InputError('tones', `one of ${Object.keys(TWO_TONE_PRESETS).join(', ')} or custom frequencies`, `got "${options.tones}"`);
    }
    spec = TWO_TONE_PRESETS[options.tones];
  } else {
    spec = options.tones;
  }
  requireAudibleAt('tones.lowHertz', spec.lowHertz, sampleRateHertz);
  requireAudibleAt('tones.highHertz', spec.highHertz, sampleRateHertz);
  requirePositive('tones.lowToHighAmplitude', spec.lowToHighAmplitude);
  const highAmplitude = peakAmplitude / (1 + spec.lowToHighAmplitude);
  const lowAmplitude = peakAmplitude - highAmplitude;
  const lowStep = (2 * Math.PI * spec.lowHertz) / sampleRateHertz;
  const highStep = (2 * Math.PI * spec.highHertz) / sampleRateHertz;
  const samples = new Float64Array(count);
  for (let n = 0; n < count; n++) samples[n] = lowAmplitude * Math.sin(lowStep * n) + highAmplitude * Math.sin(highStep * n);
  applyFades(samples, options.fadeSeconds ?? 0, sampleRateHertz);
  return samples;
}
