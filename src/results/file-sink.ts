// Writing a large file piece by piece (results.json and results.csv of a sweep of any size): the
// pieces are gathered into chunks of about a megabyte and written synchronously, so what is held
// is one chunk, never the file.
import { closeSync, openSync, writeSync } from 'node:fs';
import { asFileSystemError } from '../core/errors.js';

const CHUNK_BYTES = 1 << 20;

export class FileSink {
  private readonly fd: number;
  private parts: Buffer[] = [];
  private held = 0;
  /** Bytes written so far, pending ones included. */
  bytes = 0;
  constructor(readonly path: string) {
    try {
      this.fd = openSync(path, 'w');
    } catch (e) {
      throw asFileSystemError(e, path);
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
      throw asFileSystemError(e, this.path);
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
