/**
 * `glowtalk.scenario/1` file -> Scenario: shape and values (schema.ts), then
 * the circuits (inline, or files read through the caller's resolver), then
 * checks across fields (frequencies against the sample rate, part refs, output
 * nodes). Every problem is one InputError naming the JSON path. Core code: the
 * caller supplies file access, so this runs in a Worker as well as in Node.
 */
import { jsonPath, parseJsonText } from '../circuit/json-text.ts';
import { parseCircuit, parseCircuitText } from '../circuit/parse.ts';
import type { Circuit } from '../circuit/types.ts';
import { InputError } from '../errors.ts';
import { TWO_TONE_PRESETS } from '../audio/signals/two-tone.ts';
import { channelGain, type ChannelSettings } from '../link/light-path/light-path.ts';
import { checkReceiver, checkTransmitter } from './circuit-refs.ts';
import { issueToInputError, type At } from '../circuit/issues.ts';
import { SCENARIO_DEFAULTS, scenarioSchema, type ChannelEntry, type CircuitEntry, type LevelEntry, type ScenarioFile, type SourceEntry } from './schema.ts';
import type { LightPathBlock, Scenario, SourceLevel, SourceSettings } from './types.ts';

/** File access for the loader; paths are as written in the scenario (relative to it). */
export interface ScenarioResolver {
  readText(relativePath: string): string;
}

/** Parses the text of a scenario file; `label` (e.g. its file name) starts every error location. */
export function loadScenarioText(text: string, resolve: ScenarioResolver, label?: string): Scenario {
  return loadScenario(parseJsonText(text, label ?? 'scenario'), resolve, label);
}

/** Validates an already-parsed JSON value and loads the circuits it names. */
export function loadScenario(json: unknown, resolve: ScenarioResolver, label?: string): Scenario {
  const at: At = (...segments) => jsonPath(label ? `${label}:` : '', segments);
  const result = scenarioSchema.safeParse(json, { reportInput: true });
  if (!result.success) throw issueToInputError(result.error.issues[0], at);
  const file = result.data;
  const sampleRateHertz = file.sampleRate ?? SCENARIO_DEFAULTS.sampleRateHertz;

  const source = toSource(file.source, sampleRateHertz, at);
  const lightPath = toLightPath(file.lightPath, sampleRateHertz, at);

  const transmitter = loadCircuit(file.transmitter.circuit, resolve, at, 'transmitter');
  checkTransmitter(transmitter.circuit, transmitter.at, file.transmitter.input, file.transmitter.led, at);
  const receiver = loadCircuit(file.receiver.circuit, resolve, at, 'receiver');
  const output: [string, string] = [file.receiver.output[0], file.receiver.output[1]];
  checkReceiver(receiver.circuit, receiver.at, file.receiver.detector, output, at);

  return {
    ...(file.title === undefined ? {} : { title: file.title }),
    ...(file.description === undefined ? {} : { description: file.description }),
    sampleRateHertz,
    oversampling: file.oversampling ?? SCENARIO_DEFAULTS.oversampling,
    method: file.method ?? SCENARIO_DEFAULTS.method,
    source,
    microphone: {
      sensitivityDbvPerPascal: file.microphone.sensitivity,
      outputResistanceOhms: file.microphone.outputResistance,
      selfNoiseDbaSpl: file.microphone.selfNoise,
      seed: file.microphone.seed ?? SCENARIO_DEFAULTS.microphoneSeed,
    },
    transmitter: {
      circuit: transmitter.circuit,
      inputSource: file.transmitter.input,
      led: file.transmitter.led,
      cutoffAmperes: file.transmitter.cutoffCurrent ?? SCENARIO_DEFAULTS.cutoffAmperes,
    },
    lightPath,
    receiver: {
      circuit: receiver.circuit,
      detector: file.receiver.detector,
      output,
      speakerOhms: file.receiver.speaker,
    },
    output: {
      listeningGainDb: file.output?.listeningGain ?? SCENARIO_DEFAULTS.listeningGainDb,
      format: file.output?.format ?? SCENARIO_DEFAULTS.outputFormat,
    },
    taps: [...(file.taps ?? [])],
  };
}

/** A circuit and the path prefix of its own errors (the scenario path when inline, the file when referenced). */
function loadCircuit(entry: CircuitEntry, resolve: ScenarioResolver, at: At, block: 'transmitter' | 'receiver'): { circuit: Circuit; at: At } {
  const where = at(block, 'circuit');
  if ('inline' in entry) {
    return { circuit: parseCircuit(entry.inline, where), at: (...segments) => jsonPath(where, segments) };
  }
  let text: string;
  try {
    text = resolve.readText(entry.file);
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    throw new InputError(where, 'a readable glowtalk.circuit/1 file, path relative to the scenario file', `cannot read "${entry.file}" (${reason})`);
  }
  return { circuit: parseCircuitText(text, entry.file), at: (...segments) => jsonPath(`${entry.file}:`, segments) };
}

function toLevel(level: LevelEntry): SourceLevel {
  return 'dbSpl' in level ? { kind: 'spl', dbSpl: level.dbSpl } : { kind: 'effort', effort: level.effort, distanceMetres: level.distance };
}

function requireBelowNyquist(hertz: number, sampleRateHertz: number, where: string): void {
  if (hertz >= sampleRateHertz / 2) {
    throw new InputError(where, `a frequency below half the sample rate (${sampleRateHertz / 2} Hz)`, `got ${hertz} Hz`);
  }
}

function toSource(entry: SourceEntry, sampleRateHertz: number, at: At): SourceSettings {
  const level = toLevel(entry.level);
  switch (entry.kind) {
    case 'recording':
      return { kind: 'recording', file: entry.file, level };
    case 'tone':
      requireBelowNyquist(entry.frequency, sampleRateHertz, at('source', 'frequency'));
      return { kind: 'tone', frequencyHertz: entry.frequency, seconds: entry.seconds, level };
    case 'two-tone': {
      const highest = TWO_TONE_PRESETS[entry.preset].highHertz;
      if (highest >= sampleRateHertz / 2) {
        throw new InputError(
          at('source', 'preset'),
          `a preset whose tones lie below half the sample rate (${sampleRateHertz / 2} Hz), or a higher sampleRate`,
          `"${entry.preset}" has a tone at ${highest} Hz`,
        );
      }
      return { kind: 'two-tone', preset: entry.preset, seconds: entry.seconds, level };
    }
    case 'sweep':
      requireBelowNyquist(entry.start, sampleRateHertz, at('source', 'start'));
      if (!(entry.end > entry.start)) throw new InputError(at('source', 'end'), `a frequency above start (${entry.start} Hz)`, `got ${entry.end} Hz`);
      requireBelowNyquist(entry.end, sampleRateHertz, at('source', 'end'));
      return { kind: 'sweep', startHertz: entry.start, endHertz: entry.end, seconds: entry.seconds, level };
    case 'pink-noise':
    case 'speech-like':
      return { kind: entry.kind, seconds: entry.seconds, seed: entry.seed ?? SCENARIO_DEFAULTS.sourceSeed, level };
  }
}

function toChannel(entry: ChannelEntry, at: At): ChannelSettings {
  if (entry.kind === 'light-guide') {
    return { kind: 'light-guide', lengthMetres: entry.length, couplingLossDb: entry.couplingLoss, attenuationDbPerMetre: entry.attenuation };
  }
  const channel: ChannelSettings = {
    kind: 'free-space',
    distanceMetres: entry.distance,
    halfPowerSemiAngleDegrees: entry.halfPowerSemiAngle,
    detectorAreaSquareMetres: entry.detectorArea,
    irradianceAngleDegrees: entry.irradianceAngle ?? SCENARIO_DEFAULTS.irradianceAngleDegrees,
    incidenceAngleDegrees: entry.incidenceAngle ?? SCENARIO_DEFAULTS.incidenceAngleDegrees,
    filterTransmission: entry.filterTransmission ?? SCENARIO_DEFAULTS.filterTransmission,
    concentratorRefractiveIndex: entry.concentratorIndex ?? SCENARIO_DEFAULTS.concentratorRefractiveIndex,
    fieldOfViewSemiAngleDegrees: entry.fieldOfView ?? SCENARIO_DEFAULTS.fieldOfViewSemiAngleDegrees,
  };
  // The line-of-sight formula assumes d² ≫ A; a gain above 1 means the detector is not small against the distance.
  const gain = channelGain(channel);
  if (gain > 1) {
    throw new InputError(
      at('lightPath', 'channel', 'detectorArea'),
      'a detector small against the distance (the line-of-sight gain assumes distance² ≫ area)',
      `the gain comes to ${Number(gain.toPrecision(3))}, more light than was sent`,
    );
  }
  return channel;
}

function toLightPath(entry: ScenarioFile['lightPath'], sampleRateHertz: number, at: At): LightPathBlock {
  let ambient: LightPathBlock['ambient'] = null;
  if (entry.ambient !== null) {
    const amplitudes = entry.ambient.harmonics ?? [...SCENARIO_DEFAULTS.flickerHarmonicAmplitudes];
    const phases = entry.ambient.phases ?? [];
    if (amplitudes.every((a) => a === 0)) {
      throw new InputError(at('lightPath', 'ambient', 'harmonics'), 'at least one amplitude above 0 (set flickerDepth to 0 for steady light)', 'all are 0');
    }
    if (phases.length > amplitudes.length) {
      throw new InputError(at('lightPath', 'ambient', 'phases'), `at most one phase per harmonic (${amplitudes.length})`, `got ${phases.length}`);
    }
    const highestHertz = 2 * entry.ambient.mainsFrequency * amplitudes.length;
    if (highestHertz >= sampleRateHertz / 2) {
      throw new InputError(
        at('lightPath', 'ambient', 'harmonics'),
        `harmonics below half the sample rate (${sampleRateHertz / 2} Hz)`,
        `${amplitudes.length} harmonics reach ${highestHertz} Hz`,
      );
    }
    ambient = {
      meanPowerWatts: entry.ambient.power,
      mainsFrequencyHertz: entry.ambient.mainsFrequency,
      flickerModulationDepth: entry.ambient.flickerDepth,
      flickerHarmonicAmplitudes: amplitudes,
      flickerHarmonicPhasesDegrees: [...phases],
    };
  }
  return {
    channel: toChannel(entry.channel, at),
    ambient,
    darkCurrentAmperes: entry.darkCurrent ?? SCENARIO_DEFAULTS.darkCurrentAmperes,
    shotNoise: entry.shotNoise ?? SCENARIO_DEFAULTS.shotNoise,
    thermalNoiseOhms: entry.thermalNoiseResistance ?? SCENARIO_DEFAULTS.thermalNoiseOhms,
    seed: entry.seed ?? SCENARIO_DEFAULTS.lightPathSeed,
  };
}
