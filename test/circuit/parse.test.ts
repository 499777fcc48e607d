import { describe, expect, it } from 'vitest';
import { parseCircuit, parseCircuitText } from '../../src/circuit/parse.ts';
import { BUILT_IN_MODELS } from '../../src/circuit/models.ts';
import type { Circuit } from '../../src/circuit/types.ts';
import { inputErrorOf } from '../helpers/input-error.ts';

const FORMAT = 'glowtalk.circuit/1';
const R_TO_GND = { ref: 'R9', kind: 'resistor', pins: ['a', 'gnd'], value: 1000 };

/** A valid file with `parts` replaced; R9 keeps node "a" tied to ground. */
function file(parts: unknown[], extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { format: FORMAT, parts: [...parts, R_TO_GND], ...extra };
}

describe('parseCircuit', () => {
  it('maps every part kind, fills documented defaults and resolves built-in models', () => {
    const circuit = parseCircuit(
      file([
        { ref: 'V1', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: '9' },
        { ref: 'V2', kind: 'voltage-source', pins: ['in', 'gnd'], wave: { shape: 'sine', amplitude: '10m', frequency: '1k' } },
        { ref: 'I1', kind: 'current-source', pins: ['gnd', 'a'], dc: '1u', wave: { shape: 'points', points: [[0, 0], ['1m', '2u']] } },
        { ref: 'R1', kind: 'resistor', pins: ['vcc', 'c'], value: '4.7k' },
        { ref: 'C1', kind: 'capacitor', pins: ['in', 'b'], value: '100n' },
        { ref: 'L1', kind: 'inductor', pins: ['b', 'gnd'], value: '10m' },
        { ref: 'Q1', kind: 'npn', pins: ['c', 'b', 'e'], model: 'generic-npn' },
        { ref: 'Q2', kind: 'pnp', pins: ['gnd', 'e', 'vcc'], model: 'generic-pnp' },
        { ref: 'D1', kind: 'diode', pins: ['e', 'gnd'], model: 'generic-silicon-diode' },
        { ref: 'D2', kind: 'led', pins: ['vcc', 'c'], model: 'generic-blue-led' },
        { ref: 'P1', kind: 'phototransistor', pins: ['vcc', 'e'], model: 'generic-phototransistor' },
        { ref: 'P2', kind: 'phototransistor', pins: ['vcc', 'b', 'e'], model: 'generic-phototransistor', light: { dc: '5u', wave: { shape: 'upstream' } } },
      ]),
    );
    const expected: Circuit = {
      temperatureCelsius: 27,
      parts: [
        { ref: 'V1', kind: 'voltage-source', pins: ['vcc', 'gnd'], dc: 9 },
        { ref: 'V2', kind: 'voltage-source', pins: ['in', 'gnd'], dc: 0, wave: { shape: 'sine', amplitude: 0.01, frequencyHertz: 1000, phaseDegrees: 0, delaySeconds: 0 } },
        { ref: 'I1', kind: 'current-source', pins: ['gnd', 'a'], dc: 1e-6, wave: { shape: 'points', points: [[0, 0], [0.001, 2e-6]] } },
        { ref: 'R1', kind: 'resistor', pins: ['vcc', 'c'], value: 4700 },
        { ref: 'C1', kind: 'capacitor', pins: ['in', 'b'], value: 1e-7 },
        { ref: 'L1', kind: 'inductor', pins: ['b', 'gnd'], value: 0.01 },
        { ref: 'Q1', kind: 'npn', pins: ['c', 'b', 'e'], modelName: 'generic-npn', model: BUILT_IN_MODELS['generic-npn'] as never },
        { ref: 'Q2', kind: 'pnp', pins: ['gnd', 'e', 'vcc'], modelName: 'generic-pnp', model: BUILT_IN_MODELS['generic-pnp'] as never },
        { ref: 'D1', kind: 'diode', pins: ['e', 'gnd'], modelName: 'generic-silicon-diode', model: BUILT_IN_MODELS['generic-silicon-diode'] as never },
        { ref: 'D2', kind: 'led', pins: ['vcc', 'c'], modelName: 'generic-blue-led', model: BUILT_IN_MODELS['generic-blue-led'] as never },
        { ref: 'P1', kind: 'phototransistor', pins: ['vcc', 'e'], modelName: 'generic-phototransistor', model: BUILT_IN_MODELS['generic-phototransistor'] as never, light: { dc: 0 } },
        {
          ref: 'P2',
          kind: 'phototransistor',
          pins: ['vcc', 'b', 'e'],
          modelName: 'generic-phototransistor',
          model: BUILT_IN_MODELS['generic-phototransistor'] as never,
          light: { dc: 5e-6, wave: { shape: 'upstream' } },
        },
        { ref: 'R9', kind: 'resistor', pins: ['a', 'gnd'], value: 1000 },
      ],
    };
    expect(circuit).toEqual(expected);
  });

  it('keeps title and temperature, and converts sine phase and delay', () => {
    const circuit = parseCircuit(
      file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], wave: { shape: 'sine', amplitude: -1, frequency: 50, phase: 90, delay: '2m' } }], {
        title: 'hum',
        temperature: '-10',
      }),
    );
    expect(circuit.title).toBe('hum');
    expect(circuit.temperatureCelsius).toBe(-10);
    expect(circuit.parts[0]).toMatchObject({ wave: { shape: 'sine', amplitude: -1, frequencyHertz: 50, phaseDegrees: 90, delaySeconds: 0.002 } });
  });

  it('infers a file model\'s kind from the parts using it and fills its defaults', () => {
    const circuit = parseCircuit(
      file([{ ref: 'Q1', kind: 'npn', pins: ['a', 'a', 'gnd'], model: 'hot-npn' }], { models: { 'hot-npn': { saturationCurrent: '20f', forwardBeta: 300, earlyVoltage: '75' } } }),
    );
    expect(circuit.parts[0]).toMatchObject({
      modelName: 'hot-npn',
      model: { kind: 'npn', saturationCurrent: 2e-14, forwardBeta: 300, reverseBeta: 1, earlyVoltage: 75, emissionCoefficient: 1, baseEmitterCapacitance: 0, baseCollectorCapacitance: 0, collectorResistance: 0 },
    });
  });

  it('uses a file model that has a built-in model\'s name for that file only', () => {
    const models = { 'generic-red-led': { saturationCurrent: 1e-20, wavelength: '650n', quantumEfficiency: 0.05 } };
    const circuit = parseCircuit(file([{ ref: 'D1', kind: 'led', pins: ['a', 'gnd'], model: 'generic-red-led' }], { models }));
    expect(circuit.parts[0]).toMatchObject({ model: { saturationCurrent: 1e-20, wavelength: 6.5e-7, emissionCoefficient: 1 } });
    expect(BUILT_IN_MODELS['generic-red-led']).toMatchObject({ saturationCurrent: 1e-18, wavelength: 6.3e-7 });
  });

  it('accepts an unused model without a kind once its values are valid', () => {
    expect(() => parseCircuit(file([], { models: { spare: { saturationCurrent: '1n' } } }))).not.toThrow();
    expect(inputErrorOf(() => parseCircuit(file([], { models: { spare: { saturationCurrent: '1nn' } } }))).where).toBe('models.spare.saturationCurrent');
  });

  it('starts every error path with the caller\'s prefix', () => {
    const error = inputErrorOf(() => parseCircuit(file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: '4.7kk' }]), 'chain[2].circuit'));
    expect(error.where).toBe('chain[2].circuit.parts[0].value');
    expect(error.message).toMatch(/^chain\[2\]\.circuit\.parts\[0\]\.value: got "4\.7kk"; expected/);
  });
});

// Each bad input -> the JSON path the error must name, and a fragment of what it must say.
const BAD_FILES: ReadonlyArray<readonly [string, unknown, string, RegExp]> = [
  ['not an object', [1, 2], 'top level', /expected an object with the fields format/],
  ['wrong format tag', { format: 'glowtalk.circuit/2', parts: [R_TO_GND] }, 'format', /got "glowtalk.circuit\/2"; expected "glowtalk.circuit\/1"/],
  ['missing format', { parts: [R_TO_GND] }, 'format', /missing/],
  ['unknown top-level key', file([], { author: 'x' }), 'author', /unknown field; expected only the fields format, title, temperature, parts, models/],
  ['no parts', { format: FORMAT, parts: [] }, 'parts', /at least one part/],
  ['unknown kind', file([{ ref: 'X1', kind: 'transformer', pins: ['a', 'gnd'] }]), 'parts[0].kind', /got "transformer"; expected "kind" one of resistor, capacitor, inductor, voltage-source, current-source, diode, led, npn, pnp, phototransistor/],
  ['part not an object', file(['R1']), 'parts[0]', /a part object/],
  ['unknown part field', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: 1, tolerance: 0.05 }]), 'parts[0].tolerance', /only the fields ref, kind, pins, value/],
  ['wrong pin count', file([{ ref: 'Q1', kind: 'npn', pins: ['a', 'gnd'], model: 'generic-npn' }]), 'parts[0].pins', /got 2 items; expected exactly 3 node names \[collector, base, emitter\]/],
  ['phototransistor with 4 pins', file([{ ref: 'P1', kind: 'phototransistor', pins: ['a', 'b', 'c', 'gnd'], model: 'generic-phototransistor' }]), 'parts[0].pins', /\[collector, emitter\] or 3/],
  ['pin not a string', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 0], value: 1 }]), 'parts[0].pins[1]', /a node name/],
  ['node name with a space', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'my node'], value: 1 }]), 'parts[0].pins[1]', /without spaces/],
  ['duplicate ref', file([{ ref: 'R9', kind: 'resistor', pins: ['a', 'gnd'], value: 1 }]), 'parts[1].ref', /"R9" is already parts\[0\]\.ref/],
  ['missing ref', file([{ kind: 'resistor', pins: ['a', 'gnd'], value: 1 }]), 'parts[0].ref', /missing; expected a reference designator/],
  ['malformed value', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: '4.7kk' }]), 'parts[0].value', /got "4\.7kk"; expected a value in ohms > 0: a number in SI units or a string in engineering notation/],
  ['boolean value', file([{ ref: 'C1', kind: 'capacitor', pins: ['a', 'gnd'], value: true }]), 'parts[0].value', /got boolean true; expected a value in farads/],
  ['empty string value', file([{ ref: 'L1', kind: 'inductor', pins: ['a', 'gnd'], value: '' }]), 'parts[0].value', /got ""; expected a value in henries/],
  ['zero resistance', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: 0 }]), 'parts[0].value', /got 0; expected a value in ohms > 0/],
  ['missing value', file([{ ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'] }]), 'parts[0].value', /missing/],
  ['bad source dc', file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: '5 V' }]), 'parts[0].dc', /got "5 V"; expected a value in volts/],
  ['unknown wave shape', file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], wave: { shape: 'square' } }]), 'parts[0].wave.shape', /got "square"; expected "shape" one of sine, points, upstream/],
  ['sine without frequency', file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], wave: { shape: 'sine', amplitude: 1 } }]), 'parts[0].wave.frequency', /missing; expected a frequency in hertz > 0/],
  ['negative sine delay', file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], wave: { shape: 'sine', amplitude: 1, frequency: 1, delay: -1 } }]), 'parts[0].wave.delay', /expected a delay in seconds >= 0/],
  ['points not increasing', file([{ ref: 'I1', kind: 'current-source', pins: ['a', 'gnd'], wave: { shape: 'points', points: [[0, 0], ['1m', 1], ['1m', 2]] } }]), 'parts[0].wave.points[2][0]', /0\.001 s does not come after 0\.001 s; expected times strictly increasing/],
  ['no points', file([{ ref: 'I1', kind: 'current-source', pins: ['a', 'gnd'], wave: { shape: 'points', points: [] } }]), 'parts[0].wave.points', /at least one \[seconds, value\] pair/],
  ['point of three numbers', file([{ ref: 'I1', kind: 'current-source', pins: ['a', 'gnd'], wave: { shape: 'points', points: [[0, 1, 2]] } }]), 'parts[0].wave.points[0]', /a \[seconds, value\] pair/],
  ['upstream wave with extra field', file([{ ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], wave: { shape: 'upstream', gain: 2 } }]), 'parts[0].wave.gain', /unknown field/],
  ['negative light', file([{ ref: 'P1', kind: 'phototransistor', pins: ['a', 'gnd'], model: 'generic-phototransistor', light: { dc: '-1u' } }]), 'parts[0].light.dc', /an optical power in watts >= 0/],
  ['missing model', file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'fast-diode' }]), 'parts[0].model', /no model "fast-diode".*expected the name of a diode model: generic-silicon-diode/],
  ['model name of an Object.prototype member', file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'constructor' }]), 'parts[0].model', /no model "constructor"/],
  ['no model field', file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'] }]), 'parts[0].model', /missing; expected a model name/],
  ['built-in of another kind', file([{ ref: 'D1', kind: 'led', pins: ['a', 'gnd'], model: 'generic-npn' }]), 'parts[0].model', /"generic-npn" is a built-in npn model; expected an led model: generic-red-led/],
  [
    'model shared by two kinds',
    file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'm' }, { ref: 'Q1', kind: 'npn', pins: ['a', 'a', 'gnd'], model: 'm' }], { models: { m: { saturationCurrent: 1e-14 } } }),
    'parts[1].model',
    /already used as a diode model by parts\[0\]; expected an npn model/,
  ],
  ['model kind disagrees with use', file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'm' }], { models: { m: { kind: 'led', saturationCurrent: 1e-14 } } }), 'models.m.kind', /got "led"; expected "diode"/],
  ['unknown model kind', file([], { models: { m: { kind: 'triode' } } }), 'models.m.kind', /"kind" one of diode, led, npn, pnp, phototransistor/],
  ['model missing a required parameter', file([{ ref: 'Q1', kind: 'npn', pins: ['a', 'a', 'gnd'], model: 'm' }], { models: { m: { saturationCurrent: 1e-14 } } }), 'models.m.forwardBeta', /missing \(model used by parts\[0\] as an npn model\)/],
  ['model parameter of another kind', file([{ ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'm' }], { models: { m: { saturationCurrent: 1e-9, responsivity: 0.5 } } }), 'models.m.responsivity', /not a diode parameter/],
  ['unknown model parameter', file([], { models: { m: { saturation: 1e-9 } } }), 'models.m.saturation', /unknown field; expected only the fields kind, saturationCurrent/],
  ['wavelength in nanometres by mistake', file([], { models: { m: { kind: 'led', wavelength: 630 } } }), 'models.m.wavelength', /got 630; expected a wavelength in metres between 100n and 10u/],
  ['quantum efficiency above 1', file([], { models: { m: { quantumEfficiency: 1.5 } } }), 'models.m.quantumEfficiency', /> 0 and <= 1/],
  ['collector responsivity given as base responsivity', file([], { models: { m: { responsivity: 200 } } }), 'models.m.responsivity', /not the collector current/],
  ['negative saturation current', file([], { models: { m: { saturationCurrent: '-1f' } } }), 'models.m.saturationCurrent', /a current in amperes > 0/],
  ['model name with a space', file([], { models: { 'my led': { saturationCurrent: 1 } } }), 'models["my led"]', /without spaces/],
  ['temperature below absolute zero', file([], { temperature: -300 }), 'temperature', /between -273\.15 and 500/],
  ['title not a string', file([], { title: 5 }), 'title', /got number 5; expected a title string/],
];

describe('parseCircuit rejects bad input with one InputError naming the path', () => {
  for (const [what, json, where, says] of BAD_FILES) {
    it(`${what} -> ${where}`, () => {
      const error = inputErrorOf(() => parseCircuit(json));
      expect(error.where).toBe(where);
      expect(error.message.startsWith(`${where}: `)).toBe(true);
      expect(error.message).toMatch(says);
    });
  }
});

describe('parseCircuitText', () => {
  it('parses file text and runs the topology check', () => {
    expect(parseCircuitText(JSON.stringify(file([])), 'ok.json').parts).toHaveLength(1);
    const error = inputErrorOf(() => parseCircuitText(JSON.stringify(file([{ ref: 'C1', kind: 'capacitor', pins: ['a', 'b'], value: 1 }])), 'amp.json'));
    expect(error.where).toBe('amp.json: parts[0].pins[1]');
  });

  it('reports a JSON syntax error with line and column', () => {
    const error = inputErrorOf(() => parseCircuitText('{\n  "format": "glowtalk.circuit/1",\n  "parts": [\n    { "ref": "R1", }\n  ]\n}', 'amp.json'));
    expect(error.where).toBe('amp.json line 4, column 20');
    expect(error.message).toMatch(/found "}"; expected a key in double quotes \(JSON allows no trailing comma/);
  });

  it('prefixes schema errors with the file label', () => {
    const error = inputErrorOf(() => parseCircuitText('{"format": "glowtalk.circuit/1", "parts": [{"ref": "R1", "kind": "resistor", "pins": ["a", "gnd"], "value": "1x"}]}', 'amp.json'));
    expect(error.where).toBe('amp.json: parts[0].value');
  });
});
