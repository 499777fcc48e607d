/**
 * Field builders for the scenario schema: physical values (number or
 * engineering notation), plain numbers (dB, degrees, ratios), seeds, strict
 * objects that list their fields, and a union chosen by which key is present.
 * Every check attaches IssueParams so the error reads
 * "<path>: got <value>; expected <what>".
 */
import { z } from 'zod';
import type { IssueParams } from '../circuit/schema.ts';
import { ENGINEERING_EXPECTED, ENGINEERING_PATTERN, describeInput, readEngineering } from '../units/engineering.ts';

type Range = (value: number) => boolean;
const anyValue: Range = () => true;

function fail(ctx: z.core.$RefinementCtx, expected: string, detail: string): never {
  const params: IssueParams = { expected, detail };
  ctx.addIssue({ code: 'custom', message: expected, params });
  return z.NEVER as never;
}

/**
 * A physical value: a number in SI units or an engineering-notation string
 * ("2.2k", "50u"), converted to SI, with a range check. `expected` says what
 * the range check wants, e.g. "a distance in metres > 0".
 */
export function quantity(description: string, expected: string, inRange: Range = anyValue) {
  return z
    .unknown()
    .transform((input, ctx): number => {
      const read = readEngineering(input);
      if (!read.ok) return fail(ctx, `${expected}: ${ENGINEERING_EXPECTED}`, input === undefined ? 'missing' : `got ${read.got}`);
      if (!inRange(read.value)) return fail(ctx, expected, `got ${read.value}`);
      return read.value;
    })
    .meta({ description, anyOf: [{ type: 'number' }, { type: 'string', pattern: ENGINEERING_PATTERN }] });
}

/** A plain JSON number (decibels, degrees, ratios): SI prefixes would mislead here. */
export function plainNumber(description: string, expected: string, inRange: Range = anyValue) {
  return z
    .unknown()
    .transform((input, ctx): number => {
      if (typeof input !== 'number' || !Number.isFinite(input)) {
        return fail(ctx, `${expected} (a plain number)`, input === undefined ? 'missing' : `got ${describeInput(input)}`);
      }
      if (!inRange(input)) return fail(ctx, expected, `got ${input}`);
      return input;
    })
    .meta({ description, type: 'number' });
}

export const MAX_SEED = 0xffffffff;

/** A seed for the seeded random generator: a whole number 0 … 2³² − 1. */
export function seed(description: string) {
  return plainNumber(description, `a whole number from 0 to ${MAX_SEED}`, (value) => Number.isInteger(value) && value >= 0 && value <= MAX_SEED);
}

export const positive: Range = (value) => value > 0;
export const nonNegative: Range = (value) => value >= 0;
export const between =
  (low: number, high: number): Range =>
  (value) =>
    value >= low && value <= high;

export { strictObject } from '../circuit/schema.ts';

/** A choice among strings, with an error that lists them. */
export function choice<const Values extends readonly [string, ...string[]]>(values: Values, description: string) {
  return z.enum(values, { error: `one of ${values.map((v) => JSON.stringify(v)).join(', ')}` }).meta({ description });
}

/**
 * One of several object shapes told apart by which key is present (the level
 * is {"dbSpl"} or {"effort", "distance"}): the first branch with one of its keys is
 * checked, so its own errors are reported rather than a bare "invalid input".
 */
export function unionByKey<Branches extends ReadonlyArray<readonly [readonly string[], z.ZodType]>>(
  branches: Branches,
  expected: string,
  description: string,
) {
  type Output = z.output<Branches[number][1]>;
  const jsonBranches = branches.map(([, schema]) => {
    const { $schema: _ignored, ...rest } = z.toJSONSchema(schema, { io: 'input', target: 'draft-2020-12' }) as Record<string, unknown>;
    return rest;
  });
  return z
    .unknown()
    .transform((input, ctx): Output => {
      const isObject = typeof input === 'object' && input !== null && !Array.isArray(input);
      const branch = isObject ? branches.find(([keys]) => keys.some((key) => Object.hasOwn(input, key))) : undefined;
      if (!branch) {
        const fields = isObject ? Object.keys(input).map((key) => JSON.stringify(key)).join(', ') : '';
        const got = input === undefined ? 'missing' : isObject ? `got an object with ${fields ? `the fields ${fields}` : 'no fields'}` : `got ${describeInput(input)}`;
        return fail(ctx, expected, got);
      }
      const result = branch[1].safeParse(input, { reportInput: true });
      if (result.success) return result.data as Output;
      for (const issue of result.error.issues) ctx.addIssue(issue as never);
      return z.NEVER as never;
    })
    .meta({ description, anyOf: jsonBranches });
}

/**
 * `null` (meaning `nullMeans`, e.g. "for darkness") or what `schema` accepts.
 * A value of the wrong type is told that null is allowed too.
 */
export function orNull<Inner extends z.ZodType>(schema: Inner, description: string, nullMeans: string) {
  const { $schema: _ignored, ...inner } = z.toJSONSchema(schema, { io: 'input', target: 'draft-2020-12' }) as Record<string, unknown>;
  return z
    .unknown()
    .transform((input, ctx): z.output<Inner> | null => {
      if (input === null) return null;
      const result = schema.safeParse(input, { reportInput: true });
      if (result.success) return result.data as z.output<Inner>;
      const first = result.error.issues[0];
      if (first.code === 'invalid_type' && first.path.length === 0) {
        return fail(ctx, `${first.message}, or null ${nullMeans}`, input === undefined ? 'missing' : `got ${describeInput(input)}`);
      }
      for (const issue of result.error.issues) ctx.addIssue(issue as never);
      return z.NEVER as never;
    })
    .meta({ description, anyOf: [{ type: 'null' }, inner] });
}
