/**
 * Engineering notation: "4.7k", "100n", "10µ" <-> numbers in SI units.
 * Strictly a decimal number followed by at most one SI prefix letter; no unit
 * letters, no "4k7" style, no spaces. "M" is mega and "m" is milli, as in SI.
 */

/** Prefix letter -> power of ten. Micro accepts "u", U+00B5 (micro sign) and U+03BC (Greek mu). */
const PREFIX_EXPONENTS: Readonly<Record<string, number>> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  '\u00b5': -6,
  '\u03bc': -6,
  m: -3,
  k: 3,
  M: 6,
  G: 9,
  T: 12,
};

/** Number, optional exponent (only without a prefix), optional prefix. Also used by the JSON Schema. */
export const ENGINEERING_PATTERN =
  '^[+-]?(?:[0-9]+(?:\\.[0-9]*)?|\\.[0-9]+)(?:[eE][+-]?[0-9]+|[fpnu\u00b5\u03bcmkMGT])?$';
const ENGINEERING_REGEX = new RegExp(ENGINEERING_PATTERN);

export const ENGINEERING_EXPECTED =
  'a number in SI units or a string in engineering notation such as "4.7k", "100n", "10u" (prefixes f p n u µ m k M G T)';

/**
 * Reads a number or an engineering-notation string. Returns the value in SI
 * units, or a short description of what is wrong (the caller names the path).
 */
export function readEngineering(input: unknown): { ok: true; value: number } | { ok: false; got: string } {
  if (typeof input === 'number') {
    return Number.isFinite(input) ? { ok: true, value: input } : { ok: false, got: String(input) };
  }
  if (typeof input !== 'string') return { ok: false, got: describeInput(input) };
  if (!ENGINEERING_REGEX.test(input)) return { ok: false, got: JSON.stringify(input) };
  const last = input[input.length - 1];
  const exponent = PREFIX_EXPONENTS[last];
  // Number("4.7e-3") is the correctly rounded decimal, so "4.7m" === 0.0047 exactly.
  const value = Number(exponent === undefined ? input : `${input.slice(0, -1)}e${exponent}`);
  // "1e999" matches the pattern but overflows.
  return Number.isFinite(value) ? { ok: true, value } : { ok: false, got: JSON.stringify(input) };
}

/** Like readEngineering, but returns the value or throws a plain Error (for callers without a path). */
export function parseEngineering(input: unknown): number {
  const result = readEngineering(input);
  if (!result.ok) throw new Error(`got ${result.got}; expected ${ENGINEERING_EXPECTED}`);
  return result.value;
}

export function describeInput(input: unknown): string {
  if (input === undefined) return 'nothing';
  if (input === null) return 'null';
  if (Array.isArray(input)) return 'an array';
  if (typeof input === 'object') return 'an object';
  if (typeof input === 'string') return JSON.stringify(input);
  return `${typeof input} ${String(input)}`;
}

const DISPLAY_PREFIXES: ReadonlyArray<readonly [number, string]> = [
  [12, 'T'],
  [9, 'G'],
  [6, 'M'],
  [3, 'k'],
  [0, ''],
  [-3, 'm'],
  [-6, 'µ'],
  [-9, 'n'],
  [-12, 'p'],
  [-15, 'f'],
];

/**
 * Formats for display with an SI prefix and `significantDigits` significant
 * digits, trailing zeros dropped: formatEngineering(4700, 'Ω') === "4.7 kΩ".
 */
export function formatEngineering(value: number, unitSymbol: string, significantDigits = 3): string {
  if (!Number.isFinite(value)) return `${value} ${unitSymbol}`.trimEnd();
  if (value === 0) return `0 ${unitSymbol}`.trimEnd();
  const magnitude = Math.abs(value);
  // Round first so 999.96 shows as "1 k", not "1000".
  const rounded = Number(magnitude.toPrecision(significantDigits));
  const thousands = Math.floor(Math.log10(rounded) / 3) * 3;
  const clamped = Math.max(-15, Math.min(12, thousands));
  const prefix = DISPLAY_PREFIXES.find(([e]) => e === clamped)![1];
  const scaled = Number((rounded / 10 ** clamped).toPrecision(significantDigits));
  const sign = value < 0 ? '-' : '';
  return `${sign}${scaled} ${prefix}${unitSymbol}`.trimEnd();
}
