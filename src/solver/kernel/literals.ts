/**
 * Generated code is built only from numbers and fixed identifiers, never from
 * text in user files: these turn numbers into literals and refuse anything else.
 */

/** A finite number as a JavaScript literal (negative numbers in parentheses). */
export function literal(value: number): string {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new Error(`generated code takes finite numbers only, got ${String(value)}`);
  return value < 0 || Object.is(value, -0) ? `(${String(value)})` : String(value);
}

/** An integer as a JavaScript literal. */
export function int(value: number): string {
  if (!Number.isInteger(value)) throw new Error(`generated code takes integers only, got ${String(value)}`);
  return String(value);
}
