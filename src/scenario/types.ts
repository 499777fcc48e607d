/**
 * A scenario after loading and validation (`glowtalk.scenario/1`): the whole
 * link from the talker to the speaker, every value a number in SI units,
 * circuits parsed, file references resolved. The chain runner reads only this.
 */
import type { Circuit } from '../circuit/types.ts';
import type { VocalEffort } from '../link/acoustics/sound-level.ts';
import type { AmbientLightSettings } from '../link/light-path/ambient.ts';
import type { ChannelSettings } from '../link/light-path/light-path.ts';
import type { OversamplingFactor } from '../link/oversampler.ts';
import type { TwoTonePreset } from '../audio/signals/two-tone.ts';

/** How loud the talker is at the microphone. */
export type SourceLevel =
  /** Sound pressure level at the microphone (rms for test signals, active speech level for speech). */
  | { kind: 'spl'; dbSpl: number }
  /** A vocal effort (ANSI S3.5-1997 levels at 1 m) heard from a distance (inverse-distance law). */
  | { kind: 'effort'; effort: VocalEffort; distanceMetres: number };

export type SourceSettings =
  /** A recording; `file` is as written in the scenario, `samples` is filled in by the loader. */
  | { kind: 'recording'; file: string; level: SourceLevel }
  | { kind: 'tone'; frequencyHertz: number; seconds: number; level: SourceLevel }
  | { kind: 'two-tone'; preset: TwoTonePreset; seconds: number; level: SourceLevel }
  | { kind: 'sweep'; startHertz: number; endHertz: number; seconds: number; level: SourceLevel }
  | { kind: 'pink-noise'; seconds: number; seed: number; level: SourceLevel }
  | { kind: 'speech-like'; seconds: number; seed: number; level: SourceLevel };

export interface MicrophoneBlock {
  sensitivityDbvPerPascal: number;
  outputResistanceOhms: number;
  /** A-weighted equivalent input noise in dB SPL, null for none. */
  selfNoiseDbaSpl: number | null;
  seed: number;
}

export interface TransmitterBlock {
  circuit: Circuit;
  /** Ref of the voltage source the microphone drives (its wave must be `upstream`). */
  inputSource: string;
  /** Ref of the LED that carries the signal. */
  led: string;
  /** LED current below which it counts as cut off, amperes. */
  cutoffAmperes: number;
}

export interface LightPathBlock {
  channel: ChannelSettings;
  ambient: Omit<AmbientLightSettings, 'sampleRateHertz'> | null;
  darkCurrentAmperes: number;
  shotNoise: boolean;
  /** Resistance whose thermal-noise current adds at the detector, null for none. */
  thermalNoiseOhms: number | null;
  seed: number;
}

export interface ReceiverBlock {
  circuit: Circuit;
  /** Ref of the phototransistor lit by the light path. */
  detector: string;
  /** The speaker's node pair [plus, minus]. */
  output: [string, string];
  /** Speaker load placed across `output` by the chain, ohms; null when the circuit has its own. */
  speakerOhms: number | null;
}

export interface OutputSettings {
  /** Gain applied to the far end for listening only (stated in the report), dB. */
  listeningGainDb: number;
  format: 'pcm16' | 'float32';
}

export interface Scenario {
  title?: string;
  description?: string;
  /** Rate of the source, the microphone and the far end. */
  sampleRateHertz: number;
  oversampling: OversamplingFactor;
  /** Integration rule of both circuits. */
  method: 'tr' | 'bdf2';
  source: SourceSettings;
  microphone: MicrophoneBlock;
  transmitter: TransmitterBlock;
  lightPath: LightPathBlock;
  receiver: ReceiverBlock;
  output: OutputSettings;
  /** Signals to capture, e.g. "transmitter.led", "receiver.Q2.collector", "light.detectorWatts". */
  taps: string[];
}
