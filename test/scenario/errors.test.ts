import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../src/scenario/load.ts';
import { FILES, filesResolver, fullScenario, inputErrorOf, minimalScenario } from './fixtures.ts';

type Json = Record<string, any>;

/** [what is wrong, change to a valid scenario, error location, words the message must contain]. */
const CASES: Array<[string, (json: Json) => void, string, string[]]> = [
  ['an unknown top-level key', (j) => (j.colour = 'red'), 'colour', ['unknown field', 'only the fields format, title']],
  ['an unknown key in a nested object', (j) => (j.lightPath.channel.colour = 'red'), 'lightPath.channel.colour', ['unknown field', 'distance']],
  ['a wrong format tag', (j) => (j.format = 'glowtalk.scenario/2'), 'format', ['"glowtalk.scenario/1"']],
  ['a missing block', (j) => delete j.microphone, 'microphone', ['missing', 'sensitivity']],
  ['a bad integration method', (j) => (j.method = 'euler'), 'method', ['got "euler"', '"tr", "bdf2"']],
  ['a bad vocal effort', (j) => (j.source.level = { effort: 'whisper', distance: 1 }), 'source.level.effort', ['"whisper"', '"normal", "raised", "loud", "shout"']],
  ['a level with neither form', (j) => (j.source.level = { loudness: 3 }), 'source.level', ['{"dbSpl": 72}', 'got an object with the fields "loudness"']],
  ['an effort level without its distance', (j) => (j.source.level = { effort: 'loud' }), 'source.level.distance', ['missing', 'distance in metres']],
  ['a bad source kind', (j) => (j.source = { kind: 'noise', seconds: 1 }), 'source.kind', ['"noise"', 'recording, tone, two-tone']],
  ['a bad two-tone preset', (j) => (j.source = { kind: 'two-tone', preset: 'dim', seconds: 1, level: { dbSpl: 70 } }), 'source.preset', ['"smpte", "ccif"']],
  ['a bad channel kind', (j) => (j.lightPath.channel = { kind: 'fibre' }), 'lightPath.channel.kind', ['"fibre"', 'light-guide, free-space']],
  ['a bad output format', (j) => (j.output.format = 'mp3'), 'output.format', ['"pcm16", "float32"']],
  ['an oversampling factor of 3', (j) => (j.oversampling = 3), 'oversampling', ['got number 3', '2, 4 or 8']],
  ['a mains frequency of 55 Hz', (j) => (j.lightPath.ambient.mainsFrequency = 55), 'lightPath.ambient.mainsFrequency', ['50 or 60']],
  ['a negative distance', (j) => (j.lightPath.channel.distance = -4), 'lightPath.channel.distance', ['got -4', 'a distance in metres > 0']],
  ['a negative light-guide length', (j) => (j.lightPath.channel = { kind: 'light-guide', length: '-2', couplingLoss: 3, attenuation: 0.2 }), 'lightPath.channel.length', ['got -2']],
  ['a malformed engineering value', (j) => (j.microphone.outputResistance = '2.2kk'), 'microphone.outputResistance', ['got "2.2kk"', 'engineering notation']],
  ['a unit letter in a value', (j) => (j.lightPath.ambient.power = '1uW'), 'lightPath.ambient.power', ['got "1uW"']],
  ['an engineering string where a plain number is wanted', (j) => (j.microphone.sensitivity = '-44m'), 'microphone.sensitivity', ['plain number', 'got "-44m"']],
  ['a sample rate that is not whole', (j) => (j.sampleRate = 44100.5), 'sampleRate', ['whole number of hertz from 8000 to 192000']],
  ['a sample rate too low', (j) => (j.sampleRate = '4k'), 'sampleRate', ['got 4000']],
  ['a negative seed', (j) => (j.microphone.seed = -1), 'microphone.seed', ['whole number from 0 to 4294967295']],
  ['a missing self-noise', (j) => delete j.microphone.selfNoise, 'microphone.selfNoise', ['missing', 'or null for none']],
  ['a missing ambient', (j) => delete j.lightPath.ambient, 'lightPath.ambient', ['missing', 'or null for darkness']],
  ['a string for shotNoise', (j) => (j.lightPath.shotNoise = 'yes'), 'lightPath.shotNoise', ['true or false']],
  ['a zero speaker', (j) => (j.receiver.speaker = 0), 'receiver.speaker', ['got 0', 'or null when the circuit has its own load']],
  ['a one-node output', (j) => (j.receiver.output = ['spk']), 'receiver.output', ['exactly 2 node names', 'got 1 item']],
  ['an output node with a space', (j) => (j.receiver.output = ['spk', 'g nd']), 'receiver.output[1]', ['without spaces']],
  ['an empty recording path', (j) => (j.source = { kind: 'recording', file: '', level: { dbSpl: 70 } }), 'source.file', ['WAV file path']],
  ['a source longer than the limit', (j) => (j.source.seconds = 601), 'source.seconds', ['<= 600']],
  ['a circuit that is neither a path nor an object', (j) => (j.transmitter.circuit = 42), 'transmitter.circuit', ['got number 42', 'inline glowtalk.circuit/1 object']],
  // Checks across fields.
  ['a tone at half the sample rate', (j) => (j.source.frequency = 22050), 'source.frequency', ['below half the sample rate (22050 Hz)']],
  ['a sweep that ends below its start', (j) => (j.source = { kind: 'sweep', start: 1000, end: 500, seconds: 1, level: { dbSpl: 70 } }), 'source.end', ['above start (1000 Hz)']],
  [
    'a two-tone preset above half the sample rate',
    (j) => ((j.sampleRate = 32000), (j.source = { kind: 'two-tone', preset: 'ccif', seconds: 1, level: { dbSpl: 70 } })),
    'source.preset',
    ['"ccif" has a tone at 20000 Hz'],
  ],
  ['more phases than harmonics', (j) => (j.lightPath.ambient.phases = [0, 0, 0]), 'lightPath.ambient.phases', ['at most one phase per harmonic (2)']],
  ['flicker harmonics all zero', (j) => (j.lightPath.ambient.harmonics = [0, 0]), 'lightPath.ambient.harmonics', ['at least one amplitude above 0']],
  ['flicker harmonics above half the sample rate', (j) => (j.lightPath.ambient.harmonics = new Array(250).fill(0.01)), 'lightPath.ambient.harmonics', ['250 harmonics reach 25000 Hz']],
  ['a detector too large for its distance', (j) => ((j.lightPath.channel.distance = '1m'), (j.lightPath.channel.detectorArea = 1e-4)), 'lightPath.channel.detectorArea', ['distance² ≫ area']],
  ['the same node twice as output', (j) => (j.receiver.output = ['spk', 'spk']), 'receiver.output[1]', ['both are "spk"']],
  // Refs into the circuits.
  ['an input ref that is missing', (j) => (j.transmitter.input = 'V9'), 'transmitter.input', ['no part "V9"', 'candidates: VMIC']],
  ['an input ref that is a resistor', (j) => (j.transmitter.input = 'RB1'), 'transmitter.input', ['"RB1" is a resistor']],
  ['an input ref that is not upstream', (j) => (j.transmitter.input = 'VCC'), 'transmitter.input', ['"VCC" has no wave', '"wave": {"shape": "upstream"}']],
  ['an led ref that is not an LED', (j) => (j.transmitter.led = 'Q1'), 'transmitter.led', ['"Q1" is an NPN transistor', 'candidates: D1']],
  ['an led ref that is missing', (j) => (j.transmitter.led = 'D7'), 'transmitter.led', ['no part "D7"']],
  ['a detector ref that is not a phototransistor', (j) => (j.receiver.detector = 'RE'), 'receiver.detector', ['"RE" is a resistor', 'candidates: Q1']],
  ['an output node missing from the receiver', (j) => (j.receiver.output = ['spk', 'ground']), 'receiver.output[1]', ['no node "ground"', 'gnd']],
  [
    'a second upstream source in the transmitter',
    (j) => (j.transmitter.circuit.parts[0].wave = { shape: 'upstream' }),
    'transmitter.circuit.parts[0].wave',
    ['"VCC" is also upstream'],
  ],
  // Circuits.
  ['a bad value inside an inline circuit', (j) => (j.transmitter.circuit.parts[3].value = '10q'), 'transmitter.circuit.parts[3].value', ['got "10q"']],
  ['a missing circuit file', (j) => (j.receiver.circuit = 'circuits/nope.json'), 'receiver.circuit', ['cannot read "circuits/nope.json"', 'ENOENT']],
];

describe('scenario errors', () => {
  for (const [what, change, where, words] of CASES) {
    it(`${what} is an InputError at ${where}`, () => {
      const json = fullScenario();
      change(json);
      const error = inputErrorOf(() => loadScenario(json, filesResolver(FILES)));
      expect(error.where).toBe(where);
      for (const word of words) expect(error.message).toContain(word);
    });
  }

  it('an error inside a referenced circuit file names that file', () => {
    const broken = JSON.parse(FILES['circuits/rx.json']);
    broken.parts[2].value = '1kk';
    const resolver = filesResolver({ 'circuits/rx.json': JSON.stringify(broken) });
    const error = inputErrorOf(() => loadScenario(fullScenario(), resolver, 'link.json'));
    expect(error.where).toBe('circuits/rx.json: parts[2].value');
  });

  it('an upstream wave in a receiver file names the file and the part', () => {
    const circuit = JSON.parse(FILES['circuits/rx.json']);
    circuit.parts[0].wave = { shape: 'upstream' };
    const error = inputErrorOf(() => loadScenario(fullScenario(), filesResolver({ 'circuits/rx.json': JSON.stringify(circuit) })));
    expect(error.where).toBe('circuits/rx.json: parts[0].wave');
    expect(error.message).toContain("except on the detector's light");
  });

  it('the detector\'s own light may be upstream', () => {
    const json = minimalScenario();
    json.receiver.circuit.parts[1].light = { dc: 0, wave: { shape: 'upstream' } };
    expect(loadScenario(json, filesResolver({})).receiver.detector).toBe('Q1');
  });

  it('a JSON syntax error in a referenced circuit file names the file and line', () => {
    const error = inputErrorOf(() => loadScenario(fullScenario(), filesResolver({ 'circuits/rx.json': '{\n "format": 1,,\n}' })));
    expect(error.where).toBe('circuits/rx.json line 2, column 14');
  });

  it('the top level must be an object', () => {
    const error = inputErrorOf(() => loadScenario([1, 2], filesResolver({})));
    expect(error.where).toBe('top level');
    expect(error.message).toContain('an object with the fields format');
  });
});
