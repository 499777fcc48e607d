/**
 * The light path between the emitter and the detector, in two steps:
 *
 * 1. `process`: emitter optical power (W) → optical power at the detector (W):
 *    P_det = H·P_emit + P_ambient(t), with H the free-space line-of-sight gain
 *    (lambertian.ts) or the light-guide transmission (light-guide.ts), and
 *    P_ambient the steady light plus mains flicker (ambient.ts). No noise here:
 *    light power is a mean, and the randomness belongs to the counted electrons.
 * 2. `photocurrent`: detector power (W) → photocurrent (A) with noise:
 *    I = R·P_det + I_dark, then shot noise of that whole current and, optionally,
 *    thermal noise of a resistance (detector-noise.ts). For a phototransistor this is
 *    the primary (base) photocurrent; its gain amplifies the noise with the signal,
 *    which is why the noise is added here and not to the collector current.
 */
import { InputError } from '../../errors.ts';
import { AmbientLight, checkAmbientLightSettings, type AmbientLightSettings } from './ambient.ts';
import { DetectorNoise, checkDetectorNoiseSettings } from './detector-noise.ts';
import { checkLightGuideSettings, lightGuideTransmission, type LightGuideSettings } from './light-guide.ts';
import { checkLineOfSightSettings, lineOfSightGain, type LineOfSightSettings } from './lambertian.ts';
import { describeValue, requireChunkFits, requireNonNegative, requireObject, requirePositive } from '../settings-checks.ts';

export type ChannelSettings =
  | ({ readonly kind: 'free-space' } & LineOfSightSettings)
  | ({ readonly kind: 'light-guide' } & LightGuideSettings);

export interface DetectorSettings {
  /** Amperes of photocurrent per watt of light (the detector model's responsivity). */
  readonly responsivityAmperesPerWatt: number;
  /** Current that flows in the dark; it carries shot noise too. */
  readonly darkCurrentAmperes: number;
  readonly shotNoise: boolean;
  /** Resistance whose thermal noise current adds to the photocurrent, or null for none. */
  readonly thermalNoiseOhms: number | null;
  readonly temperatureKelvin: number;
  readonly seed: number;
}

export interface LightPathSettings {
  readonly sampleRateHertz: number;
  readonly channel: ChannelSettings;
  /** Ambient light at the detector, or null for darkness. */
  readonly ambient: Omit<AmbientLightSettings, 'sampleRateHertz'> | null;
  readonly detector: DetectorSettings;
}

/** Checks light-path settings read from a file; `where` prefixes field names in errors. */
export function checkLightPathSettings(value: unknown, where = 'lightPath'): LightPathSettings {
  const s = requireObject(where, value);
  const sampleRateHertz = requirePositive(`${where}.sampleRateHertz`, s.sampleRateHertz, 'a positive sample rate in hertz');
  const channel = requireObject(`${where}.channel`, s.channel);
  let checkedChannel: ChannelSettings;
  if (channel.kind === 'free-space') {
    checkedChannel = { kind: 'free-space', ...checkLineOfSightSettings(channel, `${where}.channel`) };
  } else if (channel.kind === 'light-guide') {
    checkedChannel = { kind: 'light-guide', ...checkLightGuideSettings(channel, `${where}.channel`) };
  } else {
    throw new InputError(`${where}.channel.kind`, '"free-space" or "light-guide"', `got ${describeValue(channel.kind)}`);
  }
  const ambient =
    s.ambient === null
      ? null
      : checkAmbientLightSettings({ ...requireObject(`${where}.ambient`, s.ambient), sampleRateHertz }, `${where}.ambient`);
  const detector = requireObject(`${where}.detector`, s.detector);
  const noise = checkDetectorNoiseSettings({ ...detector, sampleRateHertz }, `${where}.detector`);
  return {
    sampleRateHertz,
    channel: checkedChannel,
    ambient,
    detector: {
      responsivityAmperesPerWatt: requirePositive(
        `${where}.detector.responsivityAmperesPerWatt`,
        detector.responsivityAmperesPerWatt,
        'a positive responsivity in amperes per watt',
      ),
      darkCurrentAmperes: requireNonNegative(`${where}.detector.darkCurrentAmperes`, detector.darkCurrentAmperes, 'a non-negative current in amperes'),
      shotNoise: noise.shotNoise,
      thermalNoiseOhms: noise.thermalNoiseOhms,
      temperatureKelvin: noise.temperatureKelvin,
      seed: noise.seed,
    },
  };
}

/** Gain H from emitted to detected optical power for a channel. */
export function channelGain(channel: ChannelSettings): number {
  return channel.kind === 'free-space' ? lineOfSightGain(channel) : lightGuideTransmission(channel);
}

export class LightPath {
  readonly settings: LightPathSettings;
  /** Detected / emitted optical power. */
  readonly gain: number;
  private readonly ambient: AmbientLight | null;
  private readonly noise: DetectorNoise;

  constructor(settings: LightPathSettings) {
    this.settings = checkLightPathSettings(settings);
    this.gain = channelGain(this.settings.channel);
    const { sampleRateHertz, ambient, detector } = this.settings;
    this.ambient = ambient === null ? null : new AmbientLight({ ...ambient, sampleRateHertz });
    this.noise = new DetectorNoise({
      sampleRateHertz,
      shotNoise: detector.shotNoise,
      thermalNoiseOhms: detector.thermalNoiseOhms,
      temperatureKelvin: detector.temperatureKelvin,
      seed: detector.seed,
    });
  }

  /** Emitter optical power (W) in, optical power at the detector (W) out; noiseless. */
  process(emitterWatts: Float64Array, detectorWatts: Float64Array): void {
    requireChunkFits('LightPath.process', emitterWatts, detectorWatts);
    const gain = this.gain;
    const n = emitterWatts.length;
    for (let i = 0; i < n; i++) detectorWatts[i] = gain * emitterWatts[i];
    this.ambient?.addInPlace(detectorWatts, n);
  }

  /** Optical power at the detector (W) in, noisy photocurrent (A) out. */
  photocurrent(detectorWatts: Float64Array, amperes: Float64Array): void {
    requireChunkFits('LightPath.photocurrent', detectorWatts, amperes);
    const responsivity = this.settings.detector.responsivityAmperesPerWatt;
    const dark = this.settings.detector.darkCurrentAmperes;
    const n = detectorWatts.length;
    for (let i = 0; i < n; i++) amperes[i] = responsivity * detectorWatts[i] + dark;
    this.noise.addInPlace(amperes, n);
  }

  reset(): void {
    this.ambient?.reset();
    this.noise.reset();
  }
}
