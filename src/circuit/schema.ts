/**
 * The zod schema of a `glowtalk.circuit/1` file. It checks shapes, values and
 * ranges; cross-references (models, refs, pin counts per kind) and topology are
 * checked in parse.ts and topology.ts. The published JSON Schema is generated
 * from this file (scripts/write-schemas.ts), so its descriptions are the docs.
 */
import { z } from 'zod';
import { ENGINEERING_EXPECTED, ENGINEERING_PATTERN, readEngineering } from '../units/engineering.ts';
import { MODEL_KINDS, type ModelParameterName } from './models.ts';

export const CIRCUIT_FORMAT = 'glowtalk.circuit/1';

/** Issue params our own checks attach, so the error reads "<path>: <detail>; expected <expected>". */
export interface IssueParams {
  expected: string;
  detail?: string;
}

const VALUE_JSON_SCHEMA = [{ type: 'number' }, { type: 'string', pattern: ENGINEERING_PATTERN }];

/**
 * A number or engineering-notation string, converted to SI, with a range check.
 * `expected` says what the range check wants, e.g. "a resistance in ohms > 0".
 */
function quantity(description: string, expected: string, inRange: (value: number) => boolean = () => true) {
  return z
    .unknown()
    .transform((input, ctx): number => {
      const read = readEngineering(input);
      if (!read.ok) {
        const params: IssueParams = { expected: `${expected}: ${ENGINEERING_EXPECTED}`, detail: input === undefined ? 'missing' : `got ${read.got}` };
        ctx.addIssue({ code: 'custom', message: params.expected, params });
        return z.NEVER;
      }
      if (!inRange(read.value)) {
        const params: IssueParams = { expected, detail: `got ${read.value}` };
        ctx.addIssue({ code: 'custom', message: expected, params });
        return z.NEVER;
      }
      return read.value;
    })
    .meta({ description, anyOf: VALUE_JSON_SCHEMA });
}

const positive = (value: number) => value > 0;
const nonNegative = (value: number) => value >= 0;

/** Strict object whose unknown-key error lists the allowed fields (shared with the scenario format). */
export function strictObject<Shape extends z.ZodRawShape>(shape: Shape, description?: string) {
  const allowed = Object.keys(shape).join(', ');
  const schema = z.strictObject(shape, {
    error: (issue) =>
      issue.code === 'unrecognized_keys'
        ? `only the fields ${allowed}`
        : issue.code === 'invalid_type'
          ? `an object with the fields ${allowed}`
          : undefined,
  });
  return description ? schema.meta({ description }) : schema;
}

const noSpaces = (what: string, example: string) =>
  z.string({ error: `${what} (a string, e.g. ${example})` }).regex(/^\S+$/, { error: `${what} without spaces, e.g. ${example}` });

const nodeName = noSpaces('a node name', '"out" or "gnd"').meta({ description: 'Node name; "gnd" is ground.' });

function pins(count: number, order: string) {
  return z
    .array(nodeName, { error: `an array of ${count} node names ${order}` })
    .length(count, { error: `exactly ${count} node names ${order}` })
    .meta({ description: `Node names in the order ${order}.` });
}

const ref = noSpaces('a reference designator', '"R1"').meta({ description: 'Reference designator, unique in the file.' });

const sineWave = strictObject(
  {
    shape: z.literal('sine'),
    amplitude: quantity('Peak amplitude, in the unit of the drive (V, A or W).', 'a finite amplitude'),
    frequency: quantity('Frequency in hertz.', 'a frequency in hertz > 0', positive),
    phase: quantity('Phase in degrees at t = delay.', 'a phase in degrees').optional(),
    delay: quantity('Seconds before the sine starts (zero before).', 'a delay in seconds >= 0', nonNegative).optional(),
  },
  'amplitude·sin(2π·frequency·(t − delay) + phase), added to dc; zero before delay.',
);

const timePoint = z
  .tuple([quantity('Time in seconds.', 'a time in seconds >= 0', nonNegative), quantity('Value at that time.', 'a finite value')], {
    error: 'a [seconds, value] pair',
  })
  .meta({ description: '[seconds, value]' });

const pointsWave = strictObject(
  {
    shape: z.literal('points'),
    points: z
      .array(timePoint, { error: 'an array of [seconds, value] pairs' })
      .min(1, { error: 'at least one [seconds, value] pair' })
      .superRefine((points, ctx) => {
        for (let i = 1; i < points.length; i++) {
          if (!(points[i][0] > points[i - 1][0])) {
            const params: IssueParams = {
              expected: 'times strictly increasing',
              detail: `${points[i][0]} s does not come after ${points[i - 1][0]} s`,
            };
            ctx.addIssue({ code: 'custom', message: params.expected, path: [i, 0], params });
            return;
          }
        }
      }),
  },
  'Piecewise linear through [seconds, value] points, held at the ends; added to dc.',
);

const upstreamWave = strictObject(
  { shape: z.literal('upstream') },
  'Driven sample by sample by the block upstream in a signal chain; added to dc.',
);

const WAVE_SHAPES = ['sine', 'points', 'upstream'];
const wave = z
  .discriminatedUnion('shape', [sineWave, pointsWave, upstreamWave], {
    error: (issue) =>
      issue.code === 'invalid_union' ? `"shape" one of ${WAVE_SHAPES.join(', ')}` : `a wave object with "shape" one of ${WAVE_SHAPES.join(', ')}`,
  })
  .meta({ description: 'Time-dependent addition to dc.' });

function passive(kind: 'resistor' | 'capacitor' | 'inductor', unit: string) {
  return strictObject({
    ref,
    kind: z.literal(kind),
    pins: pins(2, '[a, b]'),
    value: quantity(`Value in ${unit}, > 0.`, `a value in ${unit} > 0`, positive),
  });
}

function source(kind: 'voltage-source' | 'current-source', order: string, unit: string) {
  return strictObject({
    ref,
    kind: z.literal(kind),
    pins: pins(2, order),
    dc: quantity(`Steady value in ${unit}; default 0.`, `a value in ${unit}`).optional(),
    wave: wave.optional(),
  });
}

const model = noSpaces('a model name', '"generic-npn"').meta({
  description: 'Name of a model in this file\'s "models" or of a built-in generic model.',
});

const light = strictObject(
  {
    dc: quantity('Steady optical power reaching the part, in watts; default 0.', 'an optical power in watts >= 0', nonNegative).optional(),
    wave: wave.optional(),
  },
  'Light reaching the phototransistor, in watts; default none.',
);

export const PART_KINDS = [
  'resistor',
  'capacitor',
  'inductor',
  'voltage-source',
  'current-source',
  'diode',
  'led',
  'npn',
  'pnp',
  'phototransistor',
] as const;

export const partSchema = z
  .discriminatedUnion(
    'kind',
    [
      passive('resistor', 'ohms'),
      passive('capacitor', 'farads'),
      passive('inductor', 'henries'),
      source('voltage-source', '[plus, minus]', 'volts'),
      source('current-source', '[from, to] (current flows through the source from "from" to "to")', 'amperes'),
      strictObject({ ref, kind: z.literal('diode'), pins: pins(2, '[anode, cathode]'), model }),
      strictObject({ ref, kind: z.literal('led'), pins: pins(2, '[anode, cathode]'), model }),
      strictObject({ ref, kind: z.literal('npn'), pins: pins(3, '[collector, base, emitter]'), model }),
      strictObject({ ref, kind: z.literal('pnp'), pins: pins(3, '[collector, base, emitter]'), model }),
      strictObject({
        ref,
        kind: z.literal('phototransistor'),
        pins: z
          .array(nodeName, { error: 'an array of node names [collector, emitter] or [collector, base, emitter]' })
          .min(2, { error: '2 node names [collector, emitter] or 3 [collector, base, emitter]' })
          .max(3, { error: '2 node names [collector, emitter] or 3 [collector, base, emitter]' })
          .meta({ description: '[collector, emitter] (base internal) or [collector, base, emitter].' }),
        model,
        light: light.optional(),
      }),
    ],
    {
      error: (issue) =>
        issue.code === 'invalid_union' ? `"kind" one of ${PART_KINDS.join(', ')}` : 'a part object with "ref", "kind" and "pins"',
    },
  )
  .meta({ description: 'One part: ref, kind, pins and the kind\'s own fields.' });

const MODEL_PARAMETER_SCHEMAS = {
  saturationCurrent: quantity('Saturation current in amperes (diode, led, npn, pnp, phototransistor).', 'a current in amperes > 0', positive),
  emissionCoefficient: quantity('Emission coefficient (ideality), 1; default 1.', 'a number > 0', positive),
  seriesResistance: quantity('Series resistance in ohms (diode, led); default 0.', 'a resistance in ohms >= 0', nonNegative),
  junctionCapacitance: quantity('Constant junction capacitance in farads (diode, led); default 0.', 'a capacitance in farads >= 0', nonNegative),
  wavelength: quantity(
    'Peak emission wavelength in metres (led), e.g. "630n".',
    'a wavelength in metres between 100n and 10u, e.g. "630n"',
    (metres) => metres >= 100e-9 && metres <= 10e-6,
  ),
  quantumEfficiency: quantity(
    'External quantum efficiency, photons out per electron (led), 0 < q <= 1.',
    'photons per electron, > 0 and <= 1',
    (ratio) => ratio > 0 && ratio <= 1,
  ),
  forwardBeta: quantity('Forward current gain (npn, pnp, phototransistor).', 'a current gain > 0', positive),
  reverseBeta: quantity('Reverse current gain; default 1.', 'a current gain > 0', positive),
  earlyVoltage: quantity('Forward Early voltage in volts; omit for none.', 'a voltage in volts > 0', positive),
  baseEmitterCapacitance: quantity('Constant base-emitter capacitance in farads; default 0.', 'a capacitance in farads >= 0', nonNegative),
  baseCollectorCapacitance: quantity('Constant base-collector capacitance in farads; default 0.', 'a capacitance in farads >= 0', nonNegative),
  collectorResistance: quantity('Ohmic resistance in series with the collector, ohms; default 0 (none).', 'a resistance in ohms >= 0', nonNegative),
  responsivity: quantity(
    'Base photocurrent per watt of light reaching the part, A/W (phototransistor); at most 1 (silicon stays below about 0.9).',
    'a responsivity in A/W > 0 and <= 1 (photocurrent into the base, not the collector current)',
    (ampsPerWatt) => ampsPerWatt > 0 && ampsPerWatt <= 1,
  ),
} satisfies Record<ModelParameterName, unknown>;

const parameter = MODEL_PARAMETER_SCHEMAS;
export const modelSchema = strictObject(
  {
    kind: z.enum(MODEL_KINDS, { error: `"kind" one of ${MODEL_KINDS.join(', ')}` }).optional(),
    saturationCurrent: parameter.saturationCurrent.optional(),
    emissionCoefficient: parameter.emissionCoefficient.optional(),
    seriesResistance: parameter.seriesResistance.optional(),
    junctionCapacitance: parameter.junctionCapacitance.optional(),
    wavelength: parameter.wavelength.optional(),
    quantumEfficiency: parameter.quantumEfficiency.optional(),
    forwardBeta: parameter.forwardBeta.optional(),
    reverseBeta: parameter.reverseBeta.optional(),
    earlyVoltage: parameter.earlyVoltage.optional(),
    baseEmitterCapacitance: parameter.baseEmitterCapacitance.optional(),
    baseCollectorCapacitance: parameter.baseCollectorCapacitance.optional(),
    collectorResistance: parameter.collectorResistance.optional(),
    responsivity: parameter.responsivity.optional(),
  },
  'Model parameters; the kind follows from the parts that use the model (optional "kind" must agree).',
);

export const circuitSchema = strictObject(
  {
    format: z.literal(CIRCUIT_FORMAT, { error: `"${CIRCUIT_FORMAT}"` }).meta({ description: 'Format tag and version.' }),
    title: z.string({ error: 'a title string' }).meta({ description: 'Free text shown with results.' }).optional(),
    temperature: quantity('Ambient temperature in degrees Celsius; default 27.', 'a temperature in °C between -273.15 and 500', (celsius) => celsius > -273.15 && celsius <= 500).optional(),
    parts: z.array(partSchema, { error: 'an array of parts' }).min(1, { error: 'at least one part' }),
    models: z
      .record(noSpaces('a model name', '"my-led"'), modelSchema, {
        error: (issue) =>
          issue.code === 'invalid_key' ? 'a model name without spaces, e.g. "my-led"' : 'an object mapping model names to parameter objects',
      })
      .optional(),
  },
  'A glowtalk circuit file (glowtalk.circuit/1); see docs/circuit-format.md.',
);

export type CircuitFile = z.output<typeof circuitSchema>;
export type WaveEntry = z.output<typeof wave>;
export type PartEntry = z.output<typeof partSchema>;
export type ModelEntry = z.output<typeof modelSchema>;

/** The published JSON Schema (schema/glowtalk.circuit.schema.json); `io: 'input'` describes the file, not the parsed result. */
export function circuitJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(circuitSchema, { io: 'input', target: 'draft-2020-12' }) as Record<string, unknown>;
}
