/**
 * Generated code is built only from integers and fixed identifiers, never from
 * text in user files: indices go in as integer literals (refusing anything else),
 * every other number through the constant pool.
 */

/** An integer as a JavaScript literal. */
export function int(value: number): string {
  if (!Number.isInteger(value)) throw new Error(`generated code takes integers only, got ${String(value)}`);
  return String(value);
}

/**
 * The numbers of a generated kernel, kept out of its code: the code reads them from
 * the array `k` where it uses them, so circuits that differ only in part values share
 * one generated function and the engine optimises it once. (Read at the point of use
 * rather than hoisted into locals: hundreds of values live across the whole step loop
 * made the engine's optimising compile several times slower.)
 */
export class ConstantPool {
  readonly values: number[] = [];

  /** A name for this number in the generated code. */
  ref(value: number): string {
    if (typeof value !== 'number' || !Number.isFinite(value)) throw new Error(`generated code takes finite numbers only, got ${String(value)}`);
    this.values.push(value);
    return `k[${this.values.length - 1}]`;
  }
}
