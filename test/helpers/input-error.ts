import { InputError } from '../../src/errors.ts';

/** Runs `action` and returns the InputError it throws; fails the test if it throws something else or nothing. */
export function inputErrorOf(action: () => unknown): InputError {
  try {
    action();
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError, but it succeeded');
}
