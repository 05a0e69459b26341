// Matrices of a linear model: inline rows (numbers or parameter expressions) or a CSV file of
// numbers relative to the problem file. Cells are checked one by one so a message can name the
// CSV row and column.
import { parse as parseCsv } from 'csv-parse/sync';
import { InputError } from '../../core/errors.js';
import { constantValue } from '../equations/constants.js';
import { fail, type Site } from '../file/fail.js';
import type { FieldPath } from '../file/read-structured.js';
import type { MatrixSpec } from '../file/schema.js';
import { MAX_MATRIX_FILE_BYTES, readRegularFile, referencedFile, UnreadableFile } from '../file/read-limited.js';

export interface Matrix {
  readonly rows: number;
  readonly cols: number;
  /** Row-major. */
  readonly data: Float64Array;
  /** What the canonical definition records (values, and the CSV path when there was one). */
  readonly canonical: unknown;
}

const NUMBER_CELL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

export async function readMatrix(site: Site, path: FieldPath, spec: MatrixSpec, problemFile: string, parameters: ReadonlyMap<string, number>): Promise<Matrix> {
  const rows = typeof spec === 'string' ? await readCsvRows(site, path, spec, problemFile) : inlineRows(site, path, spec, parameters);
  if (rows.length === 0) fail(site, path, 'matrix has no rows');
  const cols = rows[0]!.length;
  const data = Float64Array.from(rows.flat());
  return { rows: rows.length, cols, data, canonical: typeof spec === 'string' ? { csv: spec, values: rows } : rows };
}

function inlineRows(site: Site, path: FieldPath, spec: readonly (readonly (string | number)[])[], parameters: ReadonlyMap<string, number>): number[][] {
  const width = spec[0]?.length ?? 0;
  return spec.map((row, i) => {
    if (row.length !== width) fail(site, [...path, i], `row ${i + 1} has ${row.length} entries, row 1 has ${width}; every row needs the same number`);
    return row.map((cell, j) => constantValue(site, [...path, i, j], cell, parameters));
  });
}

/** Rows of numbers from a CSV file beside the problem file (shared by matrices and tables). */
export async function readCsvRows(site: Site, path: FieldPath, relative: string, problemFile: string): Promise<number[][]> {
  let csvPath: string;
  let text: string;
  try {
    csvPath = await referencedFile(problemFile, relative);
    text = await readRegularFile(csvPath, MAX_MATRIX_FILE_BYTES);
  } catch (e) {
    if (e instanceof UnreadableFile) fail(site, path, `cannot read matrix file ${shownPath(relative)} (${e.reason})`);
    throw e;
  }
  let records: string[][];
  try {
    records = parseCsv(text, { bom: true, trim: true, skip_empty_lines: true, relax_column_count: true, comment: '#' }) as string[][];
  } catch (e) {
    throw new InputError(`CSV syntax error for ${pathText(path)}: ${csvReason(e)}`, csvPath);
  }
  const width = records[0]?.length ?? 0;
  return records.map((record, i) => {
    if (record.length !== width) {
      throw new InputError(`row ${i + 1} has ${record.length} cells, row 1 has ${width} (ragged matrix for ${pathText(path)})`, csvPath);
    }
    return record.map((cell, j) => {
      if (!NUMBER_CELL.test(cell)) {
        throw new InputError(`row ${i + 1}, column ${j + 1}: ${shortCell(cell)} is not a number (matrix ${pathText(path)})`, csvPath);
      }
      const value = Number(cell);
      if (!Number.isFinite(value)) {
        throw new InputError(`row ${i + 1}, column ${j + 1}: ${shortCell(cell)} is too large for a double (it reads as ${value}) (matrix ${pathText(path)})`, csvPath);
      }
      return value;
    });
  });
}

/**
 * A cell for a message: quoted when short and printable, else only its length. A file named as a
 * matrix may be anything (a key file, say), so messages never carry more of it than one short cell.
 */
function shortCell(cell: string, max = 16): string {
  return cell.length <= max && /^[\x20-\x7e]*$/.test(cell) ? `'${cell}'` : `a ${cell.length}-character cell`;
}

/** The path as the file wrote it, when short and printable. */
function shownPath(path: string): string {
  return path.length <= 120 && /^[\x20-\x7e]*$/.test(path) ? path : `(a path of ${path.length} characters)`;
}

/** csv-parse's reason without the text it quotes ("Quote Not Closed", "Invalid Opening Quote"), and the line. */
function csvReason(e: unknown): string {
  const message = e instanceof Error ? e.message : String(e);
  const reason = (message.split(':')[0] ?? message).slice(0, 60);
  const line = (e as { lines?: unknown }).lines;
  return typeof line === 'number' ? `${reason} (line ${line})` : reason;
}

function pathText(path: FieldPath): string {
  return path.join('.');
}

/** Fails unless the matrix is rows x cols; `meaning` says where the expected sizes come from. */
export function expectShape(site: Site, path: FieldPath, m: Matrix, rows: number, cols: number, meaning: string): void {
  if (m.rows !== rows || m.cols !== cols) {
    fail(site, path, `must be ${rows} x ${cols} (${meaning}); got ${m.rows} x ${m.cols}`);
  }
}
