import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/load.ts';
import { setScenarioValue } from '../../src/scenario/set-value.ts';
import { FILES, filesResolver, fullScenario, inputErrorOf, minimalScenario } from './fixtures.ts';

describe('setScenarioValue', () => {
  it('sets a value at a dotted path in a copy and leaves the original alone', () => {
    const json = minimalScenario();
    const before = JSON.stringify(json);
    const changed = setScenarioValue(json, 'lightPath.channel.length', 7) as Record<string, any>;
    expect(changed.lightPath.channel.length).toBe(7);
    expect(JSON.stringify(json)).toBe(before);
    expect(changed.transmitter.circuit).not.toBe(json.transmitter.circuit);
    expect(loadScenario(changed, filesResolver({})).lightPath.channel).toMatchObject({ lengthMetres: 7 });
  });

  it('addresses circuit parts by ref in brackets and replaces an engineering string with the number', () => {
    const changed = setScenarioValue(minimalScenario(), 'transmitter.circuit.parts[RB2].value', 4700) as Record<string, any>;
    expect(changed.transmitter.circuit.parts[4]).toEqual({ ref: 'RB2', kind: 'resistor', pins: ['base', 'gnd'], value: 4700 });
    const scenario = loadScenario(changed, filesResolver({}));
    expect(scenario.transmitter.circuit.parts.find((part) => part.ref === 'RB2')).toMatchObject({ value: 4700 });
  });

  it('addresses other arrays by index and object keys in brackets', () => {
    const json = fullScenario();
    json.transmitter.circuit.models = { 'my-led': { kind: 'led', saturationCurrent: 1e-18, wavelength: '630n', quantumEfficiency: 0.1 } };
    const changed = setScenarioValue(json, 'lightPath.ambient.harmonics[1]', 0.5) as Record<string, any>;
    expect(changed.lightPath.ambient.harmonics).toEqual([1, 0.5]);
    const model = setScenarioValue(json, 'transmitter.circuit.models[my-led].saturationCurrent', 2e-18) as Record<string, any>;
    expect(model.transmitter.circuit.models['my-led'].saturationCurrent).toBe(2e-18);
    const dotted = setScenarioValue(json, 'transmitter.circuit.models.my-led.quantumEfficiency', 0.2) as Record<string, any>;
    expect(dotted.transmitter.circuit.models['my-led'].quantumEfficiency).toBe(0.2);
  });

  it('inlines a circuit file on the path when given a resolver', () => {
    const changed = setScenarioValue(fullScenario(), 'receiver.circuit.parts[RE].value', 2200, filesResolver(FILES)) as Record<string, any>;
    expect(typeof changed.receiver.circuit).toBe('object');
    const scenario = loadScenario(changed, filesResolver({}));
    expect(scenario.receiver.circuit.parts.find((part) => part.ref === 'RE')).toMatchObject({ value: 2200 });
  });

  const BAD: Array<[string, string, number, string, string[]]> = [
    ['a misspelt field', 'lightPath.channel.distanse', 1, 'lightPath.channel.distanse', ['no field "distanse"', '(kind, distance, halfPowerSemiAngle']],
    ['an unknown part ref', 'transmitter.circuit.parts[R99].value', 1, 'transmitter.circuit.parts[R99].value', ['no entry "R99"', 'VCC, VMIC']],
    ['an index past the end', 'lightPath.ambient.harmonics[2]', 1, 'lightPath.ambient.harmonics[2]', ['an index from 0 to 1']],
    ['a value that is not numeric', 'method', 1, 'method', ['numeric value', 'method is "bdf2"']],
    ['a path that ends at an object', 'lightPath.channel', 1, 'lightPath.channel', ['numeric value', 'is an object']],
    ['a path through a number', 'sampleRate.x', 1, 'sampleRate.x', ['an object or array at sampleRate', 'is "44.1k"']],
    ['a field name after an array', 'taps.first', 1, 'taps.first', ['[ref] or [index] after taps']],
    ['a circuit file without a resolver', 'receiver.circuit.parts[RE].value', 1, 'receiver.circuit.parts[RE].value', ['is the file "circuits/rx.json"']],
    ['an empty path', '', 1, 'path', ['dotted path']],
    ['a malformed bracket', 'receiver.output[1', 1, 'path "receiver.output[1"', ['cannot read the part "output[1"']],
    ['a value that is not finite', 'lightPath.channel.distance', Number.NaN, 'value for lightPath.channel.distance', ['a finite number']],
  ];
  for (const [what, path, value, where, words] of BAD) {
    it(`${what} is an InputError at ${where}`, () => {
      const error = inputErrorOf(() => setScenarioValue(fullScenario(), path, value));
      expect(error.where).toBe(where);
      for (const word of words) expect(error.message).toContain(word);
    });
  }

  it('a default that is not written in the file is an InputError, not a new field', () => {
    const error = inputErrorOf(() => setScenarioValue(minimalScenario(), 'sampleRate', 44100));
    expect(error.where).toBe('sampleRate');
    expect(error.message).toContain('no field "sampleRate"');
    expect(error.message).toContain('must be written in first');
  });

  it('a missing circuit file on the path is an InputError naming it', () => {
    const error = inputErrorOf(() => setScenarioValue(fullScenario(), 'receiver.circuit.parts[RE].value', 1, filesResolver({})));
    expect(error.message).toContain('cannot read "circuits/rx.json"');
  });
});
