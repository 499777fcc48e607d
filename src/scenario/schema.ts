/**
 * The zod schema of a `glowtalk.scenario/1` file: shapes, values and ranges.
 * Checks across fields (frequencies below half the sample rate, circuit refs,
 * output nodes) are in load.ts. The published JSON Schema is generated from
 * this file (scripts/write-schemas.ts), so its descriptions are the docs.
 */
import { z } from 'zod';
import { TWO_TONE_PRESETS, type TwoTonePreset } from '../audio/signals/two-tone.ts';
import type { VocalEffort } from '../link/acoustics/sound-level.ts';
import { describeInput } from '../units/engineering.ts';
import { between, choice, nonNegative, orNull, plainNumber, positive, quantity, seed, strictObject, unionByKey } from './fields.ts';

export const SCENARIO_FORMAT = 'glowtalk.scenario/1';

/** Defaults written nowhere else; docs/scenario-format.md lists them. */
export const SCENARIO_DEFAULTS = {
  sampleRateHertz: 48000,
  oversampling: 4,
  method: 'tr',
  /** Separate seeds, so the noise of one block is not a scaled copy of another's. */
  sourceSeed: 1,
  microphoneSeed: 2,
  lightPathSeed: 3,
  /** Well below any useful LED bias (mA) and far above junction leakage (common practice, no source). */
  cutoffAmperes: 10e-6,
  irradianceAngleDegrees: 0,
  incidenceAngleDegrees: 0,
  filterTransmission: 1,
  concentratorRefractiveIndex: null,
  fieldOfViewSemiAngleDegrees: 90,
  flickerHarmonicAmplitudes: [1],
  darkCurrentAmperes: 0,
  shotNoise: true,
  thermalNoiseOhms: null,
  listeningGainDb: 0,
  outputFormat: 'pcm16',
} as const;

export const MAX_SOURCE_SECONDS = 600;

const VOCAL_EFFORT_NAMES = ['normal', 'raised', 'loud', 'shout'] as const satisfies readonly VocalEffort[];
const TWO_TONE_PRESET_NAMES = Object.keys(TWO_TONE_PRESETS) as [TwoTonePreset, ...TwoTonePreset[]];

const noSpaces = (what: string, example: string) =>
  z.string({ error: `${what} (a string, e.g. ${example})` }).regex(/^\S+$/, { error: `${what} without spaces, e.g. ${example}` });

const partRef = (role: string, example: string) => noSpaces('a reference designator', example).meta({ description: role });

const level = unionByKey(
  [
    [
      ['dbSpl'],
      strictObject(
        {
          dbSpl: plainNumber(
            'Sound pressure level at the microphone, dB re 20 µPa: rms for test signals, active speech level for speech.',
            'a level from 0 to 150 dB SPL',
            between(0, 150),
          ),
        },
        'A stated level at the microphone.',
      ),
    ],
    [
      ['effort', 'distance'],
      strictObject(
        {
          effort: choice(VOCAL_EFFORT_NAMES, 'Vocal effort; its level at 1 m is from ANSI S3.5-1997 Table 3.'),
          distance: quantity('Talker-to-microphone distance in metres (inverse-distance law).', 'a distance in metres > 0 and <= 100', (m) => m > 0 && m <= 100),
        },
        'A talker of the given vocal effort at a distance.',
      ),
    ],
  ],
  'an object {"dbSpl": 72} or {"effort": "normal", "distance": 0.3}',
  'How loud the source is at the microphone.',
);

const seconds = quantity(`Duration in seconds, at most ${MAX_SOURCE_SECONDS}.`, `a duration in seconds > 0 and <= ${MAX_SOURCE_SECONDS}`, (s) => s > 0 && s <= MAX_SOURCE_SECONDS);
const hertz = (description: string) => quantity(description, 'a frequency in hertz > 0', positive);
const sourceSeed = seed(`Seed of the generator; default ${SCENARIO_DEFAULTS.sourceSeed}.`).optional();

const SOURCE_KINDS = ['recording', 'tone', 'two-tone', 'sweep', 'pink-noise', 'speech-like'];
const source = z
  .discriminatedUnion(
    'kind',
    [
      strictObject(
        {
          kind: z.literal('recording'),
          file: z
            .string({ error: 'a WAV file path relative to the scenario file, e.g. "speech/talk.wav"' })
            .min(1, { error: 'a WAV file path relative to the scenario file, e.g. "speech/talk.wav"' })
            .meta({ description: 'WAV file, path relative to the scenario file.' }),
          level,
        },
        'A recording, scaled so that its active speech level is the stated level.',
      ),
      strictObject({ kind: z.literal('tone'), frequency: hertz('Frequency in hertz.'), seconds, level }, 'A sine tone; the level is its rms.'),
      strictObject(
        { kind: z.literal('two-tone'), preset: choice(TWO_TONE_PRESET_NAMES, 'Tone pair.'), seconds, level },
        'Two summed sines for intermodulation; the level is the rms of the sum.',
      ),
      strictObject(
        { kind: z.literal('sweep'), start: hertz('Start frequency in hertz.'), end: hertz('End frequency in hertz.'), seconds, level },
        'Exponential sine sweep; the level is the rms of a sine of the same peak.',
      ),
      strictObject({ kind: z.literal('pink-noise'), seconds, seed: sourceSeed, level }, 'Seeded pink noise; the level is its rms.'),
      strictObject(
        { kind: z.literal('speech-like'), seconds, seed: sourceSeed, level },
        'Seeded synthetic speech-like signal (our own design); the level is its rms.',
      ),
    ],
    {
      error: (issue) =>
        issue.code === 'invalid_union' ? `"kind" one of ${SOURCE_KINDS.join(', ')}` : `a source object with "kind" one of ${SOURCE_KINDS.join(', ')}`,
    },
  )
  .meta({ description: 'What the talker says.' });

const microphone = strictObject(
  {
    sensitivity: plainNumber('Sensitivity in dBV/Pa (dB re 1 V for 1 Pa), e.g. -44.', 'a sensitivity from -100 to 20 dBV/Pa', between(-100, 20)),
    outputResistance: quantity('Output resistance in ohms, placed in series by the transmitter circuit, e.g. "2.2k".', 'a resistance in ohms from 0 to 1G', between(0, 1e9)),
    selfNoise: orNull(
      plainNumber('Self-noise, A-weighted dB SPL.', 'an A-weighted self-noise from -20 to 120 dB SPL, or null for none', between(-20, 120)),
      'Self-noise (equivalent input noise), A-weighted dB SPL, or null for a noiseless microphone.',
      'for a noiseless microphone',
    ),
    seed: seed(`Seed of the self-noise; default ${SCENARIO_DEFAULTS.microphoneSeed}.`).optional(),
  },
  'The microphone capsule.',
);

const circuit = z
  .unknown()
  .transform((input, ctx): { file: string } | { inline: unknown } => {
    if (typeof input === 'string' && input.length > 0) return { file: input };
    if (typeof input === 'object' && input !== null && !Array.isArray(input)) return { inline: input };
    const expected = 'a circuit file path relative to the scenario file (e.g. "circuits/tx.json") or an inline glowtalk.circuit/1 object';
    const detail = input === undefined ? 'missing' : `got ${input === '' ? 'an empty string' : describeInput(input)}`;
    ctx.addIssue({ code: 'custom', message: expected, params: { expected, detail } });
    return z.NEVER;
  })
  .meta({
    description: 'A glowtalk.circuit/1 file path relative to the scenario file, or the circuit object itself.',
    anyOf: [{ type: 'string', minLength: 1 }, { $ref: 'glowtalk.circuit.schema.json' }],
  });

const transmitter = strictObject(
  {
    circuit,
    input: partRef('Ref of the voltage source the microphone drives; its wave must be {"shape": "upstream"}.', '"VMIC"'),
    led: partRef('Ref of the LED that carries the signal.', '"D1"'),
    cutoffCurrent: quantity(
      `LED current in amperes below which the LED counts as cut off; default "10u".`,
      'a current in amperes > 0',
      positive,
    ).optional(),
  },
  'The transmitter circuit: microphone in, LED out.',
);

const angle = (description: string, expected: string, inRange: (d: number) => boolean) => plainNumber(description, expected, inRange);

const CHANNEL_KINDS = ['light-guide', 'free-space'];
const channel = z
  .discriminatedUnion(
    'kind',
    [
      strictObject(
        {
          kind: z.literal('light-guide'),
          length: quantity('Guide length in metres.', 'a length in metres from 0 to 10k', between(0, 10000)),
          couplingLoss: plainNumber('Coupling loss of both ends together, dB.', 'a coupling loss from 0 to 100 dB', between(0, 100)),
          attenuation: plainNumber('Attenuation along the guide, dB per metre.', 'an attenuation from 0 to 100 dB/m', between(0, 100)),
        },
        'A light guide: loss = couplingLoss + attenuation × length (dB of optical power).',
      ),
      strictObject(
        {
          kind: z.literal('free-space'),
          distance: quantity('Emitter-to-detector distance in metres.', 'a distance in metres > 0', positive),
          halfPowerSemiAngle: angle('Emitter half-power semi-angle in degrees (60 is an ideal Lambertian).', 'an angle above 0 and below 90 degrees', (d) => d > 0 && d < 90),
          detectorArea: quantity(
            'Detector area in square metres; a prefix scales the number, so "10u" is 1e-5 m² (10 mm²).',
            'an area in square metres > 0, e.g. 1e-5 or "10u" for 10 mm²',
            positive,
          ),
          irradianceAngle: angle('Angle between the emitter axis and the line to the detector, degrees; default 0.', 'an angle from 0 to 180 degrees', between(0, 180)).optional(),
          incidenceAngle: angle('Angle between the detector normal and the line to the emitter, degrees; default 0.', 'an angle from 0 to 180 degrees', between(0, 180)).optional(),
          filterTransmission: plainNumber('Optical filter transmission, 0 to 1; default 1.', 'a transmission from 0 to 1', between(0, 1)).optional(),
          concentratorIndex: orNull(
            plainNumber('Refractive index of the concentrator.', 'a refractive index from 1 to 4, or null for no concentrator', between(1, 4)),
            'Refractive index of an ideal concentrator in front of the detector, or null for none (default).',
            'for no concentrator',
          ).optional(),
          fieldOfView: angle('Receiver field-of-view semi-angle, degrees; default 90.', 'an angle above 0 and up to 90 degrees', (d) => d > 0 && d <= 90).optional(),
        },
        'Line of sight from a Lambertian emitter to a small detector.',
      ),
    ],
    {
      error: (issue) =>
        issue.code === 'invalid_union' ? `"kind" one of ${CHANNEL_KINDS.join(', ')}` : `a channel object with "kind" one of ${CHANNEL_KINDS.join(', ')}`,
    },
  )
  .meta({ description: 'How the light gets from the LED to the detector.' });

const ambient = strictObject(
  {
    power: quantity('Mean ambient optical power at the detector, watts, e.g. "1u".', 'an optical power in watts >= 0', nonNegative),
    mainsFrequency: z.literal([50, 60], { error: 'a mains frequency of 50 or 60 (Hz)' }).meta({ description: 'Mains frequency in hertz; lamps flicker at twice it.' }),
    flickerDepth: plainNumber('Flicker modulation depth (Pmax − Pmin)/(Pmax + Pmin), 0 to 1.', 'a modulation depth from 0 to 1', between(0, 1)),
    harmonics: z
      .array(plainNumber('Relative amplitude.', 'a relative amplitude >= 0', nonNegative), { error: 'an array of relative amplitudes, e.g. [1, 0.2]' })
      .min(1, { error: 'at least one relative amplitude' })
      .meta({ description: 'Relative amplitudes of the flicker harmonics, the first at twice the mains frequency; default [1].' })
      .optional(),
    phases: z
      .array(plainNumber('Phase in degrees.', 'a phase in degrees'), { error: 'an array of phases in degrees' })
      .meta({ description: 'Phase in degrees of each harmonic; missing entries are 0.' })
      .optional(),
  },
  'Ambient light at the detector with mains flicker.',
);

const lightPath = strictObject(
  {
    channel,
    ambient: orNull(ambient, 'Ambient light at the detector, or null for darkness.', 'for darkness'),
    darkCurrent: quantity('Dark current of the detector in amperes (it carries shot noise); default 0.', 'a current in amperes >= 0', nonNegative).optional(),
    shotNoise: z.boolean({ error: 'true or false' }).meta({ description: 'Shot noise of the photocurrent; default true.' }).optional(),
    thermalNoiseResistance: orNull(
      quantity('Resistance in ohms.', 'a resistance in ohms > 0, or null for none', positive),
      'Resistance whose thermal-noise current adds at the detector, or null for none (default).',
      'for none',
    ).optional(),
    seed: seed(`Seed of the detector noise; default ${SCENARIO_DEFAULTS.lightPathSeed}.`).optional(),
  },
  'From the LED light to the photocurrent.',
);

const nodeName = noSpaces('a node name', '"spk" or "gnd"');

const receiver = strictObject(
  {
    circuit,
    detector: partRef('Ref of the phototransistor lit by the light path.', '"Q1"'),
    output: z
      .array(nodeName, { error: 'an array of 2 node names [plus, minus]' })
      .length(2, { error: 'exactly 2 node names [plus, minus]' })
      .meta({ description: 'The speaker\'s nodes [plus, minus] in the receiver circuit.' }),
    speaker: orNull(
      quantity('Speaker resistance in ohms.', 'a speaker resistance in ohms > 0, or null when the circuit has its own load', positive),
      'Speaker resistance in ohms placed across output by the chain, or null when the circuit has its own load.',
      'when the circuit has its own load',
    ),
  },
  'The receiver circuit: phototransistor in, speaker out.',
);

const output = strictObject(
  {
    listeningGain: plainNumber('Gain for listening only, dB (stated in the report); default 0.', 'a gain from -60 to 60 dB', between(-60, 60)).optional(),
    format: choice(['pcm16', 'float32'], 'Sample format of the WAV files written; default "pcm16".').optional(),
  },
  'What is written for listening.',
);

export const scenarioSchema = strictObject(
  {
    format: z.literal(SCENARIO_FORMAT, { error: `"${SCENARIO_FORMAT}"` }).meta({ description: 'Format tag and version.' }),
    title: z.string({ error: 'a title string' }).meta({ description: 'Free text shown with results.' }).optional(),
    description: z.string({ error: 'a description string' }).meta({ description: 'Free text.' }).optional(),
    sampleRate: quantity(
      'Sample rate of the source, the microphone and the far end, hertz; whole number from 8000 to 192000; default 48000.',
      'a whole number of hertz from 8000 to 192000',
      (hz) => Number.isInteger(hz) && hz >= 8000 && hz <= 192000,
    ).optional(),
    oversampling: z.literal([2, 4, 8], { error: 'an oversampling factor of 2, 4 or 8' }).meta({ description: 'Circuits run at sampleRate × this; default 4.' }).optional(),
    method: choice(['tr', 'bdf2'], 'Integration rule of both circuits: trapezoidal or second-order backward difference; default "tr".').optional(),
    source,
    microphone,
    transmitter,
    lightPath,
    receiver,
    output: output.optional(),
    taps: z
      .array(noSpaces('a tap name', '"transmitter.led"'), { error: 'an array of tap names, e.g. ["transmitter.led"]' })
      .meta({ description: 'Signals to capture, e.g. "transmitter.led"; checked by the chain.' })
      .optional(),
  },
  'A glowtalk scenario file (glowtalk.scenario/1); see docs/scenario-format.md.',
);

export type ScenarioFile = z.output<typeof scenarioSchema>;
export type LevelEntry = z.output<typeof level>;
export type SourceEntry = z.output<typeof source>;
export type ChannelEntry = z.output<typeof channel>;
export type CircuitEntry = z.output<typeof circuit>;

/** The published JSON Schema (schema/glowtalk.scenario.schema.json); `io: 'input'` describes the file. */
export function scenarioJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(scenarioSchema, { io: 'input', target: 'draft-2020-12' }) as Record<string, unknown>;
}
