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

/**
 * A file-system failure on a path stepgauge reads or writes for the user. `code` is the system's
 * (ENOSPC, EACCES, EISDIR...); the CLI maps it to an exit code (src/cli/exit-codes.ts).
 */
export class FileSystemError extends Error {
  readonly code: string;
  readonly path: string;
  constructor(code: string, path: string, message: string) {
    super(`${path}: ${message}`);
    this.name = 'FileSystemError';
    this.code = code;
    this.path = path;
  }
}

const SYSTEM_WORDS: Record<string, string> = {
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'read-only file system',
  EIO: 'input/output error',
  EISDIR: 'is a folder, where a file was expected',
  ENOTDIR: 'a part of the path is a file, where a folder was expected',
  EEXIST: 'already exists',
  ENOENT: 'no such file or folder',
  ENAMETOOLONG: 'name too long',
  EMFILE: 'too many open files',
  ENFILE: 'too many open files in the system',
  EFBIG: 'file too large',
  ELOOP: 'too many symbolic links',
};

/** The system error code of a thrown Node error (ENOSPC...), if it has one. */
export function systemCode(e: unknown): string | undefined {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' && /^E[A-Z0-9]+$/.test(code) ? code : undefined;
}

/** Wraps a Node file-system error as FileSystemError naming `path` (the user's path, not a temporary); anything else is returned as it is. */
export function asFileSystemError(e: unknown, path: string, doing = 'cannot write'): unknown {
  if (e instanceof FileSystemError) return e;
  const code = systemCode(e);
  if (!code) return e;
  // mkdir -p answers EEXIST when a part of the path is a file.
  const words = code === 'EEXIST' && (e as { syscall?: unknown }).syscall === 'mkdir' ? SYSTEM_WORDS.ENOTDIR : SYSTEM_WORDS[code];
  return new FileSystemError(code, path, `${doing}: ${words ?? 'system error'} (${code})`);
}
