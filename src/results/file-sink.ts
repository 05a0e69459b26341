// Writing a large file piece by piece (results.json and results.csv of a sweep of any size): the
// pieces are gathered into chunks of about a megabyte and written synchronously, so what is held
// is one chunk, never the file.
import { closeSync, openSync, readSync, writeSync } from 'node:fs';
import { asFileSystemError } from '../core/errors.js';

const CHUNK_BYTES = 1 << 20;

export class FileSink {
  private readonly fd: number;
  private parts: Buffer[] = [];
  private held = 0;
  /** Bytes written so far, pending ones included. */
  bytes = 0;
  /** `named`: the file a failure names (the target, when `path` is a temporary beside it). */
  constructor(
    readonly path: string,
    private readonly named = path,
  ) {
    try {
      this.fd = openSync(path, 'w');
    } catch (e) {
      throw asFileSystemError(e, named);
    }
  }
  write(piece: string | Uint8Array): void {
    const b = typeof piece === 'string' ? Buffer.from(piece) : Buffer.from(piece.buffer, piece.byteOffset, piece.byteLength);
    this.parts.push(b);
    this.held += b.length;
    this.bytes += b.length;
    if (this.held >= CHUNK_BYTES) this.flush();
  }
  private flush(): void {
    if (this.held === 0) return;
    const chunk = this.parts.length === 1 ? this.parts[0]! : Buffer.concat(this.parts, this.held);
    this.parts = [];
    this.held = 0;
    try {
      for (let at = 0; at < chunk.length; ) at += writeSync(this.fd, chunk, at, chunk.length - at);
    } catch (e) {
      throw asFileSystemError(e, this.named);
    }
  }
  /** Writes what is pending and closes the file (closed even when that write fails). */
  close(): void {
    try {
      this.flush();
    } finally {
      closeSync(this.fd);
    }
  }
}

/**
 * The byte ranges [offset, offset + length) of the file at `path`, read one at a time as the
 * caller iterates (run lines kept on disk: the sweep journal, a merge's spilled runs).
 */
export function* readSpans(path: string, spans: Iterable<readonly [offset: number, length: number]>): Generator<Buffer> {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (e) {
    throw asFileSystemError(e, path, 'cannot read');
  }
  try {
    for (const [offset, length] of spans) {
      const bytes = Buffer.allocUnsafe(length);
      let got = 0;
      try {
        while (got < length) {
          const n = readSync(fd, bytes, got, length - got, offset + got);
          if (n === 0) throw new Error(`${path} ended before byte ${offset + length}`);
          got += n;
        }
      } catch (e) {
        throw asFileSystemError(e, path, 'cannot read');
      }
      yield bytes;
    }
  } finally {
    closeSync(fd);
  }
}
