/**
 * Errors meant for the user. The command line prints `message` on one line and
 * exits non-zero; anything else that escapes is a bug in glowtalk.
 */

/** Bad input: a file, a field or a flag. `where` names the JSON path, byte or flag. */
export class InputError extends Error {
  constructor(
    readonly where: string,
    readonly expected: string,
    detail?: string,
  ) {
    super(`${where}: ${detail ? `${detail}; ` : ''}expected ${expected}`);
    this.name = 'InputError';
  }
}

/** The solver could not find a solution; says when, where and which part is most at fault. */
export class ConvergenceError extends Error {
  constructor(
    message: string,
    readonly seconds: number | null,
    readonly node: string | null,
    readonly part: string | null,
  ) {
    super(message);
    this.name = 'ConvergenceError';
  }
}

/** True for the errors that are the user's to fix (print the message, no stack). */
export function isUserFacing(error: unknown): error is InputError | ConvergenceError {
  return error instanceof InputError || error instanceof ConvergenceError;
}
