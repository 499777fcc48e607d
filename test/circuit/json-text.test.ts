import { describe, expect, it } from 'vitest';
import { jsonPath, parseJsonText } from '../../src/circuit/json-text.ts';
import { InputError } from '../../src/errors.ts';

function errorOf(text: string): InputError {
  try {
    parseJsonText(text, 'f.json');
  } catch (error) {
    expect(error).toBeInstanceOf(InputError);
    return error as InputError;
  }
  throw new Error('expected an InputError');
}

describe('parseJsonText', () => {
  it('returns what JSON.parse returns for valid JSON (RFC 8259), with or without a byte-order mark', () => {
    const text = '{"a": [1, -2.5e-3, true, false, null, "x\\u00b5\\n"], "b": {}}';
    expect(parseJsonText(text)).toEqual(JSON.parse(text));
    expect(parseJsonText(`\ufeff${text}`)).toEqual(JSON.parse(text));
  });

  const CASES: ReadonlyArray<readonly [string, string, RegExp]> = [
    ['', 'line 1, column 1', /end of input; expected a JSON value/],
    ['{"a": 1,\n "b": }', 'line 2, column 7', /found "}"; expected a JSON value/],
    ['[1, 2,]', 'line 1, column 7', /no trailing comma/],
    ["{'a': 1}", 'line 1, column 2', /expected a key in double quotes/],
    ['{"a": 1 "b": 2}', 'line 1, column 9', /expected "," or "}"/],
    ['{"a": 4.7k}', 'line 1, column 10', /engineering notation like 4\.7k must be a string/],
    ['{"a": 01}', 'line 1, column 8', /a JSON number/],
    ['{"a": "x\ny"}', 'line 1, column 9', /no raw control characters/],
    ['{"a": "\\q"}', 'line 1, column 8', /a valid escape/],
    ['{"a": 1} // note', 'line 1, column 10', /end of input after the JSON value/],
    ['{"ref": "R1",\n  "ref": "R2"}', 'line 2, column 3', /key "ref" repeated; expected each key once per object/],
    ['[' .repeat(300), 'line 1, column 258', /nesting no deeper than 256/],
  ];
  for (const [text, place, says] of CASES) {
    it(`reports ${JSON.stringify(text.slice(0, 24))} at ${place}`, () => {
      const error = errorOf(text);
      expect(error.where).toBe(`f.json ${place}`);
      expect(error.message).toMatch(says);
    });
  }
});

describe('jsonPath', () => {
  it('spells array indices in brackets, plain keys with dots and other keys quoted', () => {
    expect(jsonPath('', ['parts', 2, 'pins'])).toBe('parts[2].pins');
    expect(jsonPath('chain[2].circuit', ['parts', 0, 'value'])).toBe('chain[2].circuit.parts[0].value');
    expect(jsonPath('', ['models', 'my led', 'kind'])).toBe('models["my led"].kind');
    expect(jsonPath('amp.json:', ['parts', 1])).toBe('amp.json: parts[1]');
    expect(jsonPath('', [])).toBe('top level');
  });
});
