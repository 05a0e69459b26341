// The sweep journal: one JSON line per finished run, appended as each run ends, so a crash, a
// Ctrl-C or a killed CI job loses at most the runs in flight. `run --resume` reads it back.
import { closeSync, existsSync, mkdirSync, openSync, readFileSync, rmSync, writeSync } from 'node:fs';
import { readSpans } from '../results/file-sink.js';
import { writeFileAtomicSync } from '../results/atomic.js';
import { basename, dirname, join, resolve } from 'node:path';
import type { RunResult } from '../results/contract.js';
import type { RunLines } from '../results/json.js';
import { asFileSystemError, InputError } from '../core/errors.js';

const JOURNAL_KIND = 'stepgauge-journal';
const NEWLINE = Buffer.from('\n');
const JOURNAL_VERSION = 1;

export interface JournalHeader {
  kind: typeof JOURNAL_KIND;
  version: typeof JOURNAL_VERSION;
  planSha256: string;
  request: Record<string, unknown>;
}

/** The journal of output folder `outDir` lives beside it, since the folder appears only at the end. */
export function journalPath(outDir: string): string {
  const abs = resolve(outDir);
  return join(dirname(abs), `.${basename(abs)}.journal.jsonl`);
}

export class Journal {
  readonly path: string;
  /**
   * Kept open for the sweep: opening and closing the file for each of a sweep's hundreds of runs
   * cost the main process more time than writing them.
   */
  private fd: number | null;
  /**
   * Lines not yet written. A worker's answer brings several runs at once; their lines go to the
   * file in one write when the event loop next turns (each write cost the main process of a
   * parallel sweep about 40 us, on the cores its workers need), before any further run starts
   * on this process.
   */
  private pending: Uint8Array[] = [];
  private flushQueued = false;
  /** Bytes in the file once the pending lines are written. */
  private size = 0;
  /**
   * Each run line's plan index, start and length in the file (the line feed left out), so the
   * runs can be read back in plan order one at a time (runLines) instead of held in memory.
   */
  private readonly planIndex: number[] = [];
  private readonly offset: number[] = [];
  private readonly length: number[] = [];
  constructor(outDir: string, header: Omit<JournalHeader, 'kind' | 'version'>, keep: readonly RunResult[] = []) {
    this.path = journalPath(outDir);
    const head: JournalHeader = { kind: JOURNAL_KIND, version: JOURNAL_VERSION, ...header };
    try {
      mkdirSync(dirname(this.path), { recursive: true });
      // A resumed sweep rewrites the journal with the runs it keeps: atomically, so a kill at that
      // moment leaves the old journal, never an empty one.
      const lines = [head, ...keep].map((x) => Buffer.from(JSON.stringify(x)));
      lines.forEach((line, i) => (i > 0 ? this.index(keep[i - 1]!, line.length) : (this.size += line.length + 1)));
      writeFileAtomicSync(this.path, Buffer.concat(lines.flatMap((line) => [line, NEWLINE])));
      this.fd = openSync(this.path, 'a');
    } catch (e) {
      throw asFileSystemError(e, this.path);
    }
  }
  /** A write that failed when the event loop turned (disk full): thrown by the next append or close. */
  private failure: unknown;
  /** Appends the run's line and answers it (the UTF-8 of JSON.stringify of the run) for reuse in results.json. */
  append(run: RunResult): Uint8Array {
    if (this.fd === null) throw new Error(`journal ${this.path} was already closed`);
    if (this.failure) throw this.failure;
    const bytes = Buffer.from(`${JSON.stringify(run)}\n`);
    this.index(run, bytes.length - 1);
    this.pending.push(bytes);
    if (!this.flushQueued) {
      this.flushQueued = true;
      setImmediate(() => {
        try {
          this.flush();
        } catch (e) {
          this.failure = e;
        }
      });
    }
    return bytes.subarray(0, bytes.length - 1);
  }
  private index(run: RunResult, length: number): void {
    this.planIndex.push(run.planIndex ?? -1);
    this.offset.push(this.size);
    this.length.push(length);
    this.size += length + 1;
  }

  /**
   * The run lines in plan order (for a plan index journaled twice, the later line), read from the
   * file one at a time when iterated; for after `close`. `keep` leaves runs out by plan index.
   */
  runLines(keep: (planIndex: number) => boolean = () => true): RunLines {
    const latest = new Map<number, number>();
    this.planIndex.forEach((planIndex, i) => keep(planIndex) && latest.set(planIndex, i));
    const order = Int32Array.from([...latest.keys()].sort((a, b) => a - b), (planIndex) => latest.get(planIndex)!);
    const { path, offset, length } = this;
    return {
      count: order.length,
      lines: () => readSpans(path, (function* () {
        for (const i of order) yield [offset[i]!, length[i]!] as const;
      })()),
    };
  }

  /** Writes the pending lines now. */
  flush(): void {
    this.flushQueued = false;
    if (this.fd === null || this.pending.length === 0) return;
    const lines = this.pending;
    this.pending = [];
    try {
      writeSync(this.fd, lines.length === 1 ? lines[0]! : Buffer.concat(lines));
    } catch (e) {
      throw asFileSystemError(e, this.path);
    }
  }
  /** Writes what is pending, closes the file and keeps it (an interrupted sweep is resumed from it). */
  close(): void {
    try {
      if (!this.failure) this.flush();
    } catch (e) {
      this.failure = e;
    } finally {
      if (this.fd !== null) closeSync(this.fd);
      this.fd = null;
    }
    if (this.failure) throw this.failure;
  }
  remove(): void {
    try {
      this.close();
    } finally {
      rmSync(this.path, { force: true });
    }
  }
}

export interface JournalContents {
  header: JournalHeader;
  runs: RunResult[];
}

/** Reads a journal; a torn last line (the process died mid-write) is dropped, anything else malformed is an error. */
export function readJournal(outDir: string): JournalContents | null {
  const path = journalPath(outDir);
  if (!existsSync(path)) return null;
  const lines = readFileSync(path, 'utf8').split('\n');
  if (lines.at(-1) === '') lines.pop();
  const parsed: unknown[] = [];
  lines.forEach((line, i) => {
    try {
      parsed.push(JSON.parse(line));
    } catch {
      if (i !== lines.length - 1) throw new InputError(`line ${i + 1} is not valid JSON`, path);
    }
  });
  const header = parsed[0] as JournalHeader | undefined;
  if (!header || header.kind !== JOURNAL_KIND || header.version !== JOURNAL_VERSION) {
    throw new InputError(`not a ${JOURNAL_KIND} version ${JOURNAL_VERSION} file`, path);
  }
  return { header, runs: parsed.slice(1) as RunResult[] };
}
