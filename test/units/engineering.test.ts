import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ENGINEERING_PATTERN, formatEngineering, parseEngineering, readEngineering } from '../../src/units/engineering.ts';

// Prefix factors: SI Brochure, 9th edition (BIPM 2019), Table 7 "SI prefixes".
const GOOD: ReadonlyArray<readonly [unknown, number]> = [
  ['4.7k', 4700],
  ['100n', 1e-7],
  ['2.2M', 2.2e6],
  ['10u', 1e-5],
  ['10\u00b5', 1e-5], // MICRO SIGN
  ['10\u03bc', 1e-5], // GREEK SMALL LETTER MU
  ['1f', 1e-15],
  ['22p', 22e-12],
  ['4.7m', 0.0047],
  ['1G', 1e9],
  ['3T', 3e12],
  ['470', 470],
  ['-5', -5],
  ['+3.3', 3.3],
  ['.5k', 500],
  ['5.k', 5000],
  ['1e3', 1000],
  ['1.5E-3', 0.0015],
  [47, 47],
  [-0.25, -0.25],
  [0, 0],
];

const BAD: ReadonlyArray<unknown> = [
  '4.7kk',
  '1e',
  'abc',
  '',
  ' 4.7k',
  '4.7k ',
  '4.7 k',
  '4k7', // "4k7" style is deliberately not accepted
  '4.7K', // capital K is not an SI prefix
  '4.7kΩ', // no unit letters
  '1e3k',
  '1e999', // overflows to Infinity
  '0x10',
  '.',
  '-',
  NaN,
  Infinity,
  -Infinity,
  true,
  false,
  null,
  undefined,
  {},
  [],
  [4.7],
];

describe('engineering notation', () => {
  for (const [input, expected] of GOOD) {
    it(`reads ${JSON.stringify(input)} as exactly ${expected}`, () => {
      expect(parseEngineering(input)).toBe(expected);
    });
  }

  for (const input of BAD) {
    it(`rejects ${typeof input === 'string' ? JSON.stringify(input) : String(input)} and says what it got`, () => {
      const result = readEngineering(input);
      expect(result.ok).toBe(false);
      expect(() => parseEngineering(input)).toThrow(/got .*expected a number in SI units or a string in engineering notation/);
    });
  }

  it('publishes a pattern that accepts exactly the strings the reader accepts (apart from overflow)', () => {
    const pattern = new RegExp(ENGINEERING_PATTERN);
    for (const [input] of GOOD) if (typeof input === 'string') expect(pattern.test(input)).toBe(true);
    for (const input of BAD) if (typeof input === 'string' && input !== '1e999') expect(pattern.test(input)).toBe(false);
  });
});

describe('formatEngineering', () => {
  const CASES: ReadonlyArray<readonly [number, string, string]> = [
    [4700, 'Ω', '4.7 kΩ'],
    [1e-7, 'F', '100 nF'],
    [0.0047, 'A', '4.7 mA'],
    [1.23456e-5, 'A', '12.3 µA'],
    [999.96, 'Hz', '1 kHz'], // rounds before choosing the prefix
    [-2.2e6, 'Ω', '-2.2 MΩ'],
    [0, 'V', '0 V'],
    [3.3, 'V', '3.3 V'],
    [630e-9, 'm', '630 nm'],
    [2e-14, 'A', '20 fA'],
  ];
  for (const [value, unit, text] of CASES) {
    it(`shows ${value} ${unit} as "${text}"`, () => {
      expect(formatEngineering(value, unit)).toBe(text);
    });
  }

  it('round-trips through the reader to the value rounded to the digits shown', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-15, max: 1e14, noNaN: true }), fc.boolean(), (magnitude, negative) => {
        const value = negative ? -magnitude : magnitude;
        const text = formatEngineering(value, '', 6).replace(' ', '').replace('µ', 'u');
        const back = parseEngineering(text);
        expect(Math.abs(back - value)).toBeLessThanOrEqual(Math.abs(value) * 5e-6);
      }),
      { numRuns: 500, seed: 20240601 },
    );
  });
});
