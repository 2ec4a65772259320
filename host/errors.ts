// Expected, user-facing failures anywhere in the host: one clear line and an exit code, never a stack trace.

/** A failure the user can act on (bad input, missing file, busy port). `main` prints its message alone. */
export class UserError extends Error {
  readonly userError = true;
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
    this.name = 'UserError';
  }
}

/** True for a UserError, also across module copies. */
export function isUserError(e: unknown): e is UserError {
  return typeof e === 'object' && e !== null && (e as { userError?: unknown }).userError === true;
}
