/**
 * A zod issue from a file schema -> one InputError naming the JSON path and
 * what was expected ("parts[2].value: got "4.7kk"; expected ..."). Shared by the
 * circuit and scenario formats.
 */
import type { z } from 'zod';
import { InputError } from '../errors.ts';
import { describeInput } from '../units/engineering.ts';
import type { IssueParams } from './schema.ts';

export type At = (...segments: PropertyKey[]) => string;

export function issueToInputError(issue: z.core.$ZodIssue, at: At): InputError {
  const path = [...issue.path];
  let input = (issue as { input?: unknown }).input;
  // An unknown "kind" or "shape": show that field, not the whole object.
  const discriminator = (issue as { discriminator?: string }).discriminator;
  if (discriminator && typeof input === 'object' && input !== null) input = (input as Record<string, unknown>)[discriminator];
  const got = input === undefined ? 'missing' : `got ${describeInput(input)}`;
  const zodDefault = issue.message.startsWith('Invalid input') || issue.message.startsWith('Too ');
  switch (issue.code) {
    case 'custom': {
      const params = issue.params as IssueParams | undefined;
      return new InputError(at(...path), params?.expected ?? issue.message, params?.detail);
    }
    case 'unrecognized_keys':
      return new InputError(at(...path, issue.keys[0]), issue.message, 'unknown field');
    case 'invalid_type':
      return new InputError(at(...path), zodDefault ? withArticle(issue.expected) : issue.message, got);
    case 'too_small':
    case 'too_big': {
      const detail = Array.isArray(input) ? `got ${input.length} item${input.length === 1 ? '' : 's'}` : got;
      return new InputError(at(...path), issue.message, detail);
    }
    case 'invalid_value':
      return new InputError(at(...path), zodDefault ? `one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}` : issue.message, got);
    default:
      return new InputError(at(...path), issue.message, input === undefined ? undefined : got);
  }
}

/** "an led", "a diode": articles follow the sound, and "led" is spoken as letters. */
export function withArticle(word: string): string {
  return `${/^(?:[aeio]|led|npn)/.test(word) ? 'an' : 'a'} ${word}`;
}
