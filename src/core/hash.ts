import { createHash } from 'node:crypto';

export function sha256(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

/** One source file: its path as it is named in the hash, and its text. */
export interface SourceText {
  readonly path: string;
  readonly text: string;
}

/**
 * SHA-256 over a set of source files: each file's path and text, in path order. Users' modules
 * (module-sources-sha256) and the catalogue's problems (sources-sha256) are hashed this one way.
 */
export function sourcesSha256(files: readonly SourceText[]): string {
  const sorted = [...files].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
  return sha256(sorted.map((f) => `${f.path}\n${f.text}`).join('\n'));
}

/** sha256 of the concatenation of `parts`, without building it (a plan of 100,000 runs, say). */
export function sha256Parts(parts: Iterable<string>): string {
  const h = createHash('sha256');
  for (const p of parts) h.update(p);
  return h.digest('hex');
}
