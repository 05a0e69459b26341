// Errors with context. InputError is the one user-facing failure: the CLI prints its message
// on one line and exits 2 without a stack trace.

export class InputError extends Error {
  /** e.g. a file path, a flag name, "problems/x.yaml:12:3". */
  readonly where: string | undefined;
  constructor(message: string, where?: string) {
    super(where ? `${where}: ${message}` : message);
    this.name = 'InputError';
    this.where = where;
  }
}

export function isInputError(e: unknown): e is InputError {
  return e instanceof InputError;
}

/** Message of any thrown value, for run records. */
export function messageOf(e: unknown): string {
  if (e instanceof Error) return e.message;
  return String(e);
}
