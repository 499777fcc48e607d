/**
 * Every setting a run used, as plain JSON for the report ("settings"):
 * the Scenario's own values with units in the names, defaults filled in,
 * circuits summarised (title, part count, temperature) rather than dumped,
 * plus a few derived figures a reader wants next to them.
 */
import type { Circuit } from '../circuit/types.ts';
import { speechLevelDbSpl } from '../link/acoustics/sound-level.ts';
import { channelGain } from '../link/light-path/light-path.ts';
import { SCENARIO_FORMAT } from './schema.ts';
import type { Scenario, SourceLevel } from './types.ts';

export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };

function circuitSummary(circuit: Circuit): JsonValue {
  return { title: circuit.title ?? null, partCount: circuit.parts.length, temperatureCelsius: circuit.temperatureCelsius };
}

function levelSummary(level: SourceLevel): JsonValue {
  if (level.kind === 'spl') return { kind: 'spl', dbSpl: level.dbSpl };
  // ANSI S3.5-1997 level at 1 m moved to the stated distance (inverse-distance law).
  return { kind: 'effort', effort: level.effort, distanceMetres: level.distanceMetres, dbSpl: speechLevelDbSpl(level.effort, level.distanceMetres) };
}

/** Rounds away binary noise (0.1 + 0.2) so the report reads cleanly; keeps 12 significant digits. */
function tidy(value: number): number {
  return Number(value.toPrecision(12));
}

export function settingsSummary(scenario: Scenario): { [key: string]: JsonValue } {
  const { source, microphone, transmitter, lightPath, receiver, output } = scenario;
  const gain = channelGain(lightPath.channel);
  return {
    format: SCENARIO_FORMAT,
    title: scenario.title ?? null,
    description: scenario.description ?? null,
    sampleRateHertz: scenario.sampleRateHertz,
    oversampling: scenario.oversampling,
    internalSampleRateHertz: scenario.sampleRateHertz * scenario.oversampling,
    method: scenario.method,
    source: { ...source, level: levelSummary(source.level) },
    microphone: { ...microphone },
    transmitter: {
      circuit: circuitSummary(transmitter.circuit),
      inputSource: transmitter.inputSource,
      led: transmitter.led,
      cutoffAmperes: transmitter.cutoffAmperes,
    },
    lightPath: {
      channel: { ...lightPath.channel, gain: tidy(gain), gainDb: gain > 0 ? tidy(10 * Math.log10(gain)) : null },
      ambient:
        lightPath.ambient === null
          ? null
          : {
              ...lightPath.ambient,
              flickerHarmonicAmplitudes: [...lightPath.ambient.flickerHarmonicAmplitudes],
              flickerHarmonicPhasesDegrees: [...lightPath.ambient.flickerHarmonicPhasesDegrees],
            },
      darkCurrentAmperes: lightPath.darkCurrentAmperes,
      shotNoise: lightPath.shotNoise,
      thermalNoiseOhms: lightPath.thermalNoiseOhms,
      seed: lightPath.seed,
    },
    receiver: {
      circuit: circuitSummary(receiver.circuit),
      detector: receiver.detector,
      output: [...receiver.output],
      speakerOhms: receiver.speakerOhms,
    },
    output: { ...output },
    taps: [...scenario.taps],
  };
}
